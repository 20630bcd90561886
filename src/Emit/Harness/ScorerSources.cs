using Emit.Emission;

namespace Emit.Harness;

/// <summary>
/// Generated scorer sources for one language, found in a folder through the manifest written beside them
/// (<c>NAME.emit.json</c>, docs/manifest.md), which states the model SHA-256, the options and the names the harness
/// needs. Nothing is read from the text of the sources, so a change of layout cannot mislead the harness.
/// </summary>
public sealed class ScorerSources
{
    private ScorerSources(string directory, string language, string manifestPath, SourceManifest manifest)
    {
        Directory = directory;
        Language = language;
        ManifestPath = manifestPath;
        Manifest = manifest;
        Files = manifest.FilesOf(language).Select(f => Path.Combine(directory, f.File)).ToArray();
    }

    /// <summary>The folder holding the files.</summary>
    public string Directory { get; }

    /// <summary>The emission target the files are in: <c>c</c> or <c>csharp</c>.</summary>
    public string Language { get; }

    /// <summary>Full path of the manifest.</summary>
    public string ManifestPath { get; }

    /// <summary>What the manifest states about the sources.</summary>
    public SourceManifest Manifest { get; }

    /// <summary>The scorer name (file names NAME.h/NAME.c or NAME.cs, C function prefix).</summary>
    public string Name => Manifest.Name;

    /// <summary>Full paths: NAME.h and NAME.c, or NAME.cs.</summary>
    public IReadOnlyList<string> Files { get; }

    /// <summary>The model SHA-256 the sources were generated from.</summary>
    public string ModelSha256 => Manifest.ModelSha256;

    /// <summary>True when the scorer has a threshold decision (NAME_is_unusual / IsUnusual).</summary>
    public bool HasThreshold => Manifest.HasThreshold;

    /// <summary>C#: the namespace and class name of the generated class.</summary>
    public string? Namespace => Language == "csharp" ? Manifest.Namespace : null;

    /// <summary>The generated C# class name, or null for C sources.</summary>
    public string? ClassName => Language == "csharp" ? Manifest.CSharpClass : null;

    /// <summary>C#: the class as a fully qualified expression.</summary>
    public string QualifiedClass => "global::" + Namespace + "." + ClassName;

    /// <summary>
    /// Sources built with the scorer when it is model 1 of a generated classifier (the other models' scorers and the
    /// classifier's own files, full paths of this language); empty otherwise.
    /// </summary>
    public IReadOnlyList<string> CompanionFiles { get; private set; } = [];

    /// <summary>The classifier the harness also runs (its C name, C# class and model count), or null.</summary>
    public ClassifierHarness? Classifier { get; private set; }

    /// <summary>These sources as model 1 of a classifier built beside them.</summary>
    public ScorerSources WithClassifier(ClassifierHarness classifier, IReadOnlyList<string> companions)
    {
        CompanionFiles = companions;
        Classifier = classifier;
        return this;
    }

    /// <summary>The C header (NAME.h), or the C# file.</summary>
    public string MainFile => Files[0];

    /// <summary>The C source (NAME.c), or the C# file.</summary>
    public string SourceFile => Files[^1];

    /// <summary>
    /// Finds the <paramref name="language"/> sources in <paramref name="directory"/> by their manifest: that of
    /// <paramref name="name"/> when given; otherwise the only manifest there covering the language, or the one of
    /// <paramref name="defaultName"/> when there are several. Sources without a manifest (written by an emit before
    /// manifests) are refused with the fix: regenerate them.
    /// </summary>
    public static ScorerSources Locate(string directory, string language, string? name, string defaultName)
    {
        if (!System.IO.Directory.Exists(directory))
            throw new EmitException("folder of generated sources not found", "give the folder emit compile wrote to",
                directory);
        if (name is null)
        {
            var candidates = System.IO.Directory.GetFiles(directory, "*" + SourceManifest.Suffix)
                .Select(f => Path.GetFileName(f)[..^SourceManifest.Suffix.Length])
                .Where(Naming.IsCIdentifier)
                .Order(StringComparer.Ordinal)
                .ToList();
            if (candidates.Count == 0)
            {
                string ext = language == "csharp" ? ".cs" : ".c";
                throw System.IO.Directory.GetFiles(directory, "*" + ext).Length > 0
                    ? NoManifest(directory, language, null)
                    : new EmitException($"no generated scorer here (no {SourceManifest.FileNameFor("NAME")} manifest)",
                        $"run emit compile --target {language} --out {directory}, or pass {Setting.Name.Ref()}",
                        directory);
            }
            if (candidates.Count > 1 && !candidates.Contains(defaultName)
                && ClassifierSources.Classifiers(directory) is [var classifier, ..])
            {
                int models = ClassifierManifestJson.ReadFile(
                    Path.Combine(directory, SourceManifest.FileNameFor(classifier))).Models.Count;
                throw new EmitException(
                    $"{classifier} is a classifier over {models} models, with a scorer for each",
                    $"give all {models} models to check the classifier, or one with {Setting.Name.Ref()} " +
                    $"{classifier}_k to check one scorer", directory);
            }
            name = candidates.Count == 1 ? candidates[0]
                : candidates.Contains(defaultName) ? defaultName
                : throw new EmitException($"several generated scorers here ({string.Join(", ", candidates)})",
                    $"pick one with {Setting.Name.Ref()}", directory);
        }
        Naming.CheckScorerName(name);
        var manifestPath = Path.GetFullPath(Path.Combine(directory, SourceManifest.FileNameFor(name)));
        if (!File.Exists(manifestPath)) throw NoManifest(directory, language, name);
        var manifest = SourceManifestJson.ReadFile(manifestPath);
        if (manifest.Name != name)
            throw new EmitException(
                $"the manifest describes scorer \"{Naming.CommentText(manifest.Name)}\", not \"{name}\"",
                $"regenerate the sources with emit compile --name {name}", manifestPath);
        if (!manifest.Targets.Contains(language) || manifest.FilesOf(language).Count == 0)
        {
            var both = string.Join(",", manifest.Targets.Append(language).Distinct());
            throw new EmitException(
                $"the sources here were generated for target {string.Join(",", manifest.Targets)}, not {language}",
                $"regenerate them with emit compile --target {both} --out {directory}", manifestPath);
        }
        var sources = new ScorerSources(Path.GetFullPath(directory), language, manifestPath, manifest);
        foreach (var f in sources.Files)
            if (!File.Exists(f))
                throw new EmitException("generated file not found (the manifest lists it)",
                    $"generate it with emit compile --target {language} --name {name}", f);
        return sources;
    }

    private static EmitException NoManifest(string directory, string language, string? name) =>
        new($"no manifest {SourceManifest.FileNameFor(name ?? "NAME")} beside the sources " +
            "(they were generated by an older emit, or copied without it)",
            $"regenerate them with this version: emit compile MODEL --target {language}" +
            $"{(name is null ? "" : " --name " + name)} --out {directory}", directory);
}
