namespace Emit.Harness;

/// <summary>
/// What the strict check of existing sources found for one language (<see cref="SourceCheck"/>): failures to report,
/// the files that differ, and whether the numeric comparison should run at all.
/// </summary>
public sealed record SourceCheckResult
{
    /// <summary>True when the sources were generated from another model than the one given.</summary>
    public required bool ModelChanged { get; init; }

    /// <summary>False when the comparison must not run (another model, and no model change allowed).</summary>
    public required bool Compare { get; init; }

    /// <summary>Why the sources fail the check, one sentence each; empty when they pass.</summary>
    public required IReadOnlyList<string> Failures { get; init; }

    /// <summary>The files that differ from what emit generates (or from the manifest's hashes).</summary>
    public required IReadOnlyList<SourceEdit> Edits { get; init; }

    /// <summary>Things worth knowing that do not fail the sources.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }
}
