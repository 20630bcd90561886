using System.Runtime.Intrinsics;

namespace Emit.Training;

/// <summary>
/// SplitMix64 pseudo-random generator (Steele, Lea and Flood, "Fast splittable pseudorandom number generators",
/// OOPSLA 2014; the 64-bit finaliser constants of Vigna's public-domain splitmix64.c). Our own implementation so
/// the demo data and the trainer never depend on <see cref="System.Random"/>, whose sequence may change between .NET
/// versions. Integer arithmetic only: the same seed gives the same sequence on every platform.
/// </summary>
public sealed class SplitMix64
{
    /// <summary>The generator's state increment (the golden-ratio constant of splitmix64.c).</summary>
    private const ulong Increment = 0x9E3779B97F4A7C15UL;

    private ulong _state;

    /// <summary>A generator whose first output is the SplitMix64 output for <paramref name="seed"/>.</summary>
    public SplitMix64(ulong seed) => _state = seed;

    /// <summary>The next 64 random bits.</summary>
    public ulong Next() => Emit.Reference.Xoshiro256.SplitMix64(ref _state);

    /// <summary>A double in [0, 1): the top 53 bits times 2^-53 (exact, so platform independent).</summary>
    public double NextDouble() => (Next() >> 11) * (1.0 / (1UL << 53));

    /// <summary>
    /// An integer uniform in [0, <paramref name="bound"/>), without modulo bias (rejection of the short last block).
    /// </summary>
    public int NextBelow(int bound)
    {
        if (bound <= 0) throw new ArgumentOutOfRangeException(nameof(bound), bound, "bound must be positive");
        ulong b = (ulong)bound;
        ulong limit = ulong.MaxValue - (ulong.MaxValue % b + 1) % b; // largest multiple of b, minus one
        while (true)
        {
            ulong x = Next();
            if (x <= limit) return (int)(x % b);
        }
    }

    /// <summary>
    /// destination[k] = 1 when <see cref="NextDouble"/> &lt; p[k], else 0, for k in order: the same draws and results
    /// as that loop, and the same state after it. SplitMix64's k-th state is the seed plus k times its increment,
    /// so four consecutive outputs are computed side by side in vector lanes with the same integer operations.
    /// </summary>
    public void Bernoulli(ReadOnlySpan<double> p, Span<byte> destination)
    {
        if (destination.Length < p.Length)
            throw new ArgumentOutOfRangeException(nameof(destination), "destination is shorter than p");
        ulong state = _state;
        int k = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var step = Vector256.Create(Increment, unchecked(2 * Increment), unchecked(3 * Increment),
                unchecked(4 * Increment));
            var scale = Vector256.Create(1.0 / (1UL << 53));
            for (; k <= p.Length - 4; k += 4)
            {
                var z = Vector256.Create(state) + step;
                state += unchecked(4 * Increment);
                z = (z ^ Vector256.ShiftRightLogical(z, 30)) * Vector256.Create(0xBF58476D1CE4E5B9UL);
                z = (z ^ Vector256.ShiftRightLogical(z, 27)) * Vector256.Create(0x94D049BB133111EBUL);
                z ^= Vector256.ShiftRightLogical(z, 31);
                var u = Vector256.ConvertToDouble(Vector256.ShiftRightLogical(z, 11)) * scale; // exact: 53 bits
                var on = Vector256.LessThan(u, Vector256.Create(p.Slice(k, 4))).AsUInt64();
                destination[k] = (byte)(on[0] & 1);
                destination[k + 1] = (byte)(on[1] & 1);
                destination[k + 2] = (byte)(on[2] & 1);
                destination[k + 3] = (byte)(on[3] & 1);
            }
        }
        for (; k < p.Length; k++)
        {
            double u = (Emit.Reference.Xoshiro256.SplitMix64(ref state) >> 11) * (1.0 / (1UL << 53));
            destination[k] = u < p[k] ? (byte)1 : (byte)0;
        }
        _state = state;
    }

    /// <summary>
    /// True with probability <paramref name="p"/> (one draw, even when p is 0 or 1, so streams stay aligned).
    /// </summary>
    public bool Chance(double p) => NextDouble() < p;
}
