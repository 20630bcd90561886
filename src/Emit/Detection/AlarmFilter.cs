namespace Emit.Detection;

/// <summary>
/// Runs a <see cref="AlarmFilterSpec"/> over free energies in time order (unusual when F &gt; threshold). The
/// history starts empty (all usual), as in a scorer that has just booted.
/// </summary>
public static class AlarmFilter
{
    /// <summary>The filter over one whole log.</summary>
    public static AlarmFilterRun Run(IReadOnlyList<double> energies, double threshold, AlarmFilterSpec filter)
    {
        ArgumentNullException.ThrowIfNull(filter);
        var window = new AlarmFilterWindow(filter);
        long unusual = 0, raised = 0, inAlarm = 0;
        bool was = false;
        for (int r = 0; r < energies.Count; r++)
        {
            bool u = energies[r] > threshold;
            if (u) unusual++;
            bool on = window.Push(u);
            if (on) inAlarm++;
            if (on && !was) raised++;
            was = on;
        }
        return new AlarmFilterRun(energies.Count, unusual, raised, inAlarm);
    }

    /// <summary>
    /// The number of reports from the start of <paramref name="episode"/> up to and including the one at which the
    /// filter first raises the alarm (1 = at the first report), or null when it never does.
    /// </summary>
    public static int? ReportsUntilRaised(IReadOnlyList<double> episode, double threshold, AlarmFilterSpec filter)
    {
        ArgumentNullException.ThrowIfNull(filter);
        var window = new AlarmFilterWindow(filter);
        for (int r = 0; r < episode.Count; r++)
            if (window.Push(episode[r] > threshold)) return r + 1;
        return null;
    }
}
