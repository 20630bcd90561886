namespace Emit.Emission;

/// <summary>
/// What a classifier compilation produced: the plan, one compiled scorer per model (each with its manifest) and the
/// classifier's own files.
/// </summary>
public sealed class CompiledClassifier
{
    internal CompiledClassifier(ClassifierPlan plan, IReadOnlyList<CompiledScorer> scorers,
        IReadOnlyList<GeneratedFile> files)
    {
        Plan = plan;
        Scorers = scorers;
        Files = files;
    }

    /// <summary>The classifier's plan.</summary>
    public ClassifierPlan Plan { get; }

    /// <summary>The models' scorers, in the order given (NAME_1, NAME_2, ...).</summary>
    public IReadOnlyList<CompiledScorer> Scorers { get; }

    /// <summary>The classifier's own sources (NAME.h and NAME.c, NAME.cs).</summary>
    public IReadOnlyList<GeneratedFile> Files { get; }

    /// <summary>Everything written to the output folder: each scorer's files and manifest, then the classifier's.
    /// </summary>
    public IReadOnlyList<GeneratedFile> AllFiles => [.. Scorers.SelectMany(s => s.AllFiles), .. Files];
}
