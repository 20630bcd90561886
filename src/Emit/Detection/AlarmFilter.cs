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
        var window = new Window(filter);
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
        var window = new Window(filter);
        for (int r = 0; r < episode.Count; r++)
            if (window.Push(episode[r] > threshold)) return r + 1;
        return null;
    }

    /// <summary>The last N decisions as bits of one word, and how many of them are set.</summary>
    private struct Window(AlarmFilterSpec filter)
    {
        private readonly int _k = filter.K;
        private readonly ulong _mask = (1UL << filter.N) - 1;
        private ulong _bits;

        public bool Push(bool unusual)
        {
            _bits = ((_bits << 1) | (unusual ? 1UL : 0UL)) & _mask;
            return System.Numerics.BitOperations.PopCount(_bits) >= _k;
        }
    }
}
