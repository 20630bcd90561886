namespace Emit.Detection;

/// <summary>
/// The state of a <see cref="AlarmFilterSpec"/> K-of-N filter fed one decision at a time: the last N decisions as
/// bits of one word. It starts empty (the missing decisions count as usual), as after a boot. The definition the
/// calibration's alarm counts and the check of generated filters (emit verify) both use.
/// </summary>
public sealed class AlarmFilterWindow(AlarmFilterSpec filter)
{
    private readonly int _k = filter.K;
    private readonly ulong _mask = (1UL << filter.N) - 1;
    private ulong _bits;

    /// <summary>Takes one decision; true when at least K of the last N, this one included, were unusual.</summary>
    public bool Push(bool unusual)
    {
        _bits = ((_bits << 1) | (unusual ? 1UL : 0UL)) & _mask;
        return System.Numerics.BitOperations.PopCount(_bits) >= _k;
    }
}
