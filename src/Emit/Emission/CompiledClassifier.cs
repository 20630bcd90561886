namespace Emit.Emission;

/// <summary>
/// What a classifier compilation produced: the plan, one compiled scorer per model (each with its manifest), the
/// classifier's own files and its manifest.
/// </summary>
public sealed class CompiledClassifier
{
    internal CompiledClassifier(ClassifierPlan plan, IReadOnlyList<CompiledScorer> scorers,
        IReadOnlyList<double>? priors, IReadOnlyList<(string Target, GeneratedFile File)> files,
        IReadOnlyList<TemplateUse> templates)
    {
        Plan = plan;
        Scorers = scorers;
        Files = files.Select(f => f.File).ToArray();
        Manifest = ClassifierManifest.Describe(plan, scorers, priors, files, templates);
        ManifestFile = new GeneratedFile(SourceManifest.FileNameFor(plan.Options.Name),
            ClassifierManifestJson.Write(Manifest));
    }

    /// <summary>The classifier's plan.</summary>
    public ClassifierPlan Plan { get; }

    /// <summary>The models' scorers, in the order given (NAME_1, NAME_2, ...).</summary>
    public IReadOnlyList<CompiledScorer> Scorers { get; }

    /// <summary>The classifier's own sources (NAME.h and NAME.c, NAME.cs).</summary>
    public IReadOnlyList<GeneratedFile> Files { get; }

    /// <summary>The facts about the classifier's files, as written to <see cref="ManifestFile"/>.</summary>
    public ClassifierManifest Manifest { get; }

    /// <summary>The classifier's manifest as a file: <c>NAME.emit.json</c> (docs/manifest.md).</summary>
    public GeneratedFile ManifestFile { get; }

    /// <summary>
    /// Everything written to the output folder: each scorer's files and manifest, then the classifier's files and
    /// its manifest.
    /// </summary>
    public IReadOnlyList<GeneratedFile> AllFiles =>
        [.. Scorers.SelectMany(s => s.AllFiles), .. Files, ManifestFile];
}
