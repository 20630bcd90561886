namespace Emit.Detection;

/// <summary>
/// The threshold at which a K-of-N filter raises at most a target number of alarms per day on a time-ordered normal
/// log. Candidates are the log's distinct free energies (unusual when F &gt; candidate); the largest raises none.
/// The count of raised alarms does not always fall as the threshold rises (a higher threshold can split one long
/// alarm into two), so the search bisects assuming it does and returns a candidate at which the target is met on the
/// log, checked: the lowest such candidate when the count is monotone, otherwise one near it.
/// </summary>
public static class AlarmRateSearch
{
    /// <summary>The threshold, and the filter's run over the log there.</summary>
    public static (double Threshold, AlarmFilterRun Run) ForTarget(IReadOnlyList<double> log, AlarmFilterSpec filter,
        double periodSeconds, double alarmsPerDay)
    {
        ArgumentNullException.ThrowIfNull(filter);
        if (log.Count == 0) throw new EmitException("the normal log is empty");
        if (!(alarmsPerDay >= 0) || !double.IsFinite(alarmsPerDay))
            throw new EmitException($"target of {alarmsPerDay} alarms per day is not a number >= 0");
        double days = log.Count * periodSeconds / SamplePeriod.SecondsPerDay;
        double allowed = alarmsPerDay * days;
        var candidates = log.Distinct().Order().ToArray();
        int lo = 0, hi = candidates.Length - 1;
        var best = AlarmFilter.Run(log, candidates[hi], filter);
        while (lo < hi)
        {
            int mid = lo + (hi - lo) / 2;
            var run = AlarmFilter.Run(log, candidates[mid], filter);
            if (run.Raised <= allowed) { hi = mid; best = run; }
            else lo = mid + 1;
        }
        return (candidates[hi], best);
    }
}
