namespace Emit.Harness;

/// <summary>
/// How one firmware feature emitted beside the scorer (alarm filter, explanations, streamed scoring, classifier)
/// behaved on one target: how many of its results were checked against the reference, how many disagreed, and why.
/// A target passes only when each of its features passes.
/// </summary>
/// <param name="Feature">The feature's name as the reports spell it: <c>filter</c>, <c>explain</c>, <c>stream</c>,
/// <c>classify</c>.</param>
/// <param name="Checks">Results compared with the reference (one per input, step or walk; the feature says
/// which).</param>
/// <param name="Mismatches">Compared results that disagreed beyond what the feature's stated bound allows.</param>
/// <param name="Detail">One line on what was compared and against what (for the reports).</param>
/// <param name="Failures">Why the feature failed, one sentence each (the first few mismatches); empty when it passed.
/// </param>
public sealed record FeatureResult(
    string Feature,
    long Checks,
    long Mismatches,
    string Detail,
    IReadOnlyList<string> Failures)
{
    /// <summary>True when nothing disagreed and nothing failed.</summary>
    public bool Passed => Mismatches == 0 && Failures.Count == 0;
}
