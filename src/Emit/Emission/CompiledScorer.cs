namespace Emit.Emission;

/// <summary>
/// What one compilation produced: the plan, the generated sources, the templates read to lay them out, and the
/// manifest describing them (<see cref="SourceManifest"/>, written beside the sources as <see cref="ManifestFile"/>).
/// </summary>
public sealed class CompiledScorer
{
    internal CompiledScorer(ScorerPlan plan, IReadOnlyList<string> targets,
        IReadOnlyList<(string Target, GeneratedFile File)> files, IReadOnlyList<TemplateUse> templates)
    {
        Plan = plan;
        Files = files.Select(f => f.File).ToArray();
        Templates = templates;
        Manifest = SourceManifest.Describe(plan, targets, files, templates);
        ManifestFile = new GeneratedFile(SourceManifest.FileNameFor(plan.Options.Name),
            SourceManifestJson.Write(Manifest));
    }

    /// <summary>The scorer plan every target laid out.</summary>
    public ScorerPlan Plan { get; }

    /// <summary>The generated sources, target by target, in order.</summary>
    public IReadOnlyList<GeneratedFile> Files { get; }

    /// <summary>The templates read, in the order first read.</summary>
    public IReadOnlyList<TemplateUse> Templates { get; }

    /// <summary>The facts about the sources, as written to <see cref="ManifestFile"/>.</summary>
    public SourceManifest Manifest { get; }

    /// <summary>The manifest as a file: <c>NAME.emit.json</c>.</summary>
    public GeneratedFile ManifestFile { get; }

    /// <summary>The sources followed by the manifest: everything written to the output folder.</summary>
    public IReadOnlyList<GeneratedFile> AllFiles => [.. Files, ManifestFile];
}
