namespace Emit.Harness;

/// <summary>
/// The pseudo-random walk of flips the harness runs from each test vector to check streamed scoring, defined once
/// here and laid out in the C and C# harness templates: seed = 32-bit FNV-1a of the packed input (0 becomes
/// 0x9E3779B9), then per step one xorshift32 step (shifts 13, 17, 5: Marsaglia, "Xorshift RNGs", J. Stat. Softw. 8(14),
/// 2003) and a flip of unit state mod VISIBLE. The stream's free energy is read after <see cref="FirstRead"/> and after
/// <see cref="Steps"/> flips: for float modes the first read comes one flip before the state is accumulated afresh
/// (the largest drift) and the second eight flips after it.
/// </summary>
public static class StreamWalk
{
    /// <summary>Explanations: units the harness asks for per input.</summary>
    public const int ExplainUnits = 4;

    /// <summary>Flips between fresh accumulations in float modes (the generated code's resync period).</summary>
    public static int Period(int visible) => Math.Max(64, visible);

    /// <summary>The flip after which the stream is read first.</summary>
    public static int FirstRead(int visible) => Period(visible) - 1;

    /// <summary>The flips of a walk (the stream is read again at the end).</summary>
    public static int Steps(int visible) => Period(visible) + 8;

    /// <summary>The walk's seed for a packed input.</summary>
    public static uint Seed(ReadOnlySpan<byte> packed)
    {
        uint x = 2166136261u;
        foreach (var b in packed)
        {
            x ^= b;
            x *= 16777619u;
        }
        return x == 0 ? 0x9E3779B9u : x;
    }

    /// <summary>One step: the next state.</summary>
    public static uint Next(uint x)
    {
        x ^= x << 13;
        x ^= x >> 17;
        x ^= x << 5;
        return x;
    }

    /// <summary>
    /// Runs the walk on <paramref name="units"/> (one byte per unit, changed in place) and returns copies of the
    /// vector at the two reads.
    /// </summary>
    public static (byte[] First, byte[] Last) Run(ReadOnlySpan<byte> packed, Span<byte> units)
    {
        int v = units.Length;
        uint x = Seed(packed);
        byte[] first = [];
        for (int step = 1; step <= Steps(v); step++)
        {
            x = Next(x);
            int unit = (int)(x % (uint)v);
            units[unit] = units[unit] != 0 ? (byte)0 : (byte)1;
            if (step == FirstRead(v)) first = units.ToArray();
        }
        return (first, units.ToArray());
    }
}
