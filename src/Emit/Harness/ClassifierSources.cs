using Emit.Emission;
using Emit.Model;

namespace Emit.Harness;

/// <summary>
/// A generated classifier found in a folder through its manifest (<c>NAME.emit.json</c> with a <c>classifier</c>
/// object, docs/manifest.md): the models it was generated from, its options and its files. <see cref="CheckModels"/>
/// holds the models given to verify against those the manifest records; anything amiss is an
/// <see cref="EmitException"/> (exit 2), since a classifier is only defined by its models in their order.
/// </summary>
public sealed class ClassifierSources
{
    private ClassifierSources(string directory, string manifestPath, ClassifierManifest manifest)
    {
        Directory = directory;
        ManifestPath = manifestPath;
        Manifest = manifest;
    }

    /// <summary>The folder holding the files (full path).</summary>
    public string Directory { get; }

    /// <summary>Full path of the classifier's manifest.</summary>
    public string ManifestPath { get; }

    /// <summary>What the manifest states.</summary>
    public ClassifierManifest Manifest { get; }

    /// <summary>
    /// The classifier in <paramref name="directory"/>: the one named <paramref name="name"/>, or without a name the
    /// only classifier manifest there.
    /// </summary>
    public static ClassifierSources Locate(string directory, string? name)
    {
        if (!System.IO.Directory.Exists(directory))
            throw new EmitException("folder of generated sources not found", "give the folder emit compile wrote to",
                directory);
        var present = Classifiers(directory);
        if (name is null)
        {
            name = present.Count switch
            {
                1 => present[0],
                0 => throw new EmitException(
                    $"no generated classifier here (no {SourceManifest.FileNameFor("NAME")} manifest of a classifier)",
                    "run emit compile MODEL1 MODEL2 ... --name NAME --out DIR first, or give one model to check a " +
                    "scorer", directory),
                _ => throw new EmitException($"several generated classifiers here ({string.Join(", ", present)})",
                    $"pick one with {Setting.Name.Ref()}", directory),
            };
        }
        Naming.CheckScorerName(name);
        var path = Path.GetFullPath(Path.Combine(directory, SourceManifest.FileNameFor(name)));
        if (!File.Exists(path))
            throw new EmitException($"no classifier {name} here (no {SourceManifest.FileNameFor(name)})",
                present.Count == 0
                    ? "run emit compile MODEL1 MODEL2 ... --name NAME --out DIR first"
                    : $"the classifiers here: {string.Join(", ", present)}", directory);
        var text = ClassifierManifestJson.ReadText(path);
        if (!ClassifierManifestJson.IsClassifierText(text, path))
            throw new EmitException($"{name} is a scorer, not a classifier",
                present.Count == 0
                    ? $"give one model to check scorer {name}"
                    : $"give the classifier's name ({Setting.Name.Ref()} {present[0]}), or one model to check " +
                      $"scorer {name}", path);
        var manifest = ClassifierManifestJson.Read(text, path);
        if (manifest.Name != name)
            throw new EmitException(
                $"the manifest describes classifier \"{Naming.CommentText(manifest.Name)}\", not \"{name}\"",
                $"regenerate the classifier with emit compile MODEL1 MODEL2 ... --name {name}", path);
        var sources = new ClassifierSources(Path.GetFullPath(directory), path, manifest);
        foreach (var f in manifest.Files.Select(e => e.File).Concat(manifest.Models.Select(m => m.Manifest)))
            if (!File.Exists(Path.Combine(sources.Directory, f)))
                throw new EmitException("generated file not found (the classifier's manifest lists it)",
                    $"regenerate the classifier with emit compile MODEL1 MODEL2 ... --name {name}",
                    Path.Combine(sources.Directory, f));
        return sources;
    }

    /// <summary>The names of the classifiers whose manifests lie in <paramref name="directory"/>, sorted.</summary>
    public static IReadOnlyList<string> Classifiers(string directory) =>
        System.IO.Directory.GetFiles(directory, "*" + SourceManifest.Suffix)
            .Where(ClassifierManifestJson.IsClassifier)
            .Select(f => Path.GetFileName(f)[..^SourceManifest.Suffix.Length])
            .Where(Naming.IsCIdentifier)
            .Order(StringComparer.Ordinal)
            .ToList();

    /// <summary>
    /// Checks that <paramref name="models"/> (with their file names, <paramref name="labels"/>) are the models the
    /// classifier was generated from, in its order: same count, and each model's identity hash the recorded one.
    /// </summary>
    public void CheckModels(IReadOnlyList<BoltzmannModel> models, IReadOnlyList<string> labels)
    {
        var recorded = Manifest.Models;
        var name = Manifest.Name;
        var order = string.Join(" ", recorded.Select(m => Naming.CommentText(m.File)));
        string Short(string sha) => sha.Length > 16 ? sha[..16] + "..." : sha;
        for (int k = 0; k < recorded.Count; k++)
        {
            var want = recorded[k];
            if (k < models.Count && models[k].Sha256 == want.Sha256) continue;
            if (models.Any(m => m.Sha256 == want.Sha256))
                throw new EmitException(
                    $"the models are not in the manifest's order: class {k + 1} of classifier {name} is " +
                    $"{Naming.CommentText(want.File)}",
                    $"give them in the manifest's order: {order}", ManifestPath);
            int same = labels.ToList().IndexOf(want.File);
            if (same >= 0)
                throw new EmitException(
                    $"{Naming.CommentText(want.File)} has sha256 {Short(models[same].Sha256)}, but classifier {name} " +
                    $"was generated from {Naming.CommentText(want.File)} with sha256 {Short(want.Sha256)}",
                    $"regenerate the classifier from the models (emit compile {order} --name {name}), or give " +
                    "the models it was generated from", ManifestPath);
            throw new EmitException(
                $"classifier {name} was generated from {Naming.CommentText(want.File)} (model {k + 1} of " +
                $"{recorded.Count}, sha256 {Short(want.Sha256)}), which is not among the models given",
                $"give the models in the manifest's order: {order}", ManifestPath);
        }
        if (models.Count > recorded.Count)
            throw new EmitException(
                $"{models.Count} models given, but classifier {name} was generated from {recorded.Count}",
                $"give the models in the manifest's order: {order}", ManifestPath);
    }
}
