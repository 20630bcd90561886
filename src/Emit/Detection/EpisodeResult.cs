namespace Emit.Detection;

/// <summary>How fast the filter raises the alarm in time-ordered anomaly episodes.</summary>
/// <param name="Filter">The filter (1/1 when none was given).</param>
/// <param name="Names">A name per episode.</param>
/// <param name="Lengths">Reports per episode.</param>
/// <param name="ReportsUntilRaised">Per episode, the reports up to and including the one that raised the alarm, or null
/// when it was never raised.</param>
/// <param name="MeanReportsUntilRaised">The mean over the episodes where the alarm was raised, or null when it never
/// was.</param>
public sealed record EpisodeResult(
    AlarmFilterSpec Filter,
    IReadOnlyList<string> Names,
    IReadOnlyList<int> Lengths,
    IReadOnlyList<int?> ReportsUntilRaised,
    double? MeanReportsUntilRaised)
{
    /// <summary>Episodes in which the alarm was raised.</summary>
    public int Raised => ReportsUntilRaised.Count(r => r is not null);
}
