using System.Buffers.Binary;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

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
    /// so eight (or four) consecutive outputs are computed side by side in vector lanes with the same integer
    /// operations.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Bernoulli(ReadOnlySpan<double> p, Span<byte> destination)
    {
        if (destination.Length < p.Length)
            throw new ArgumentOutOfRangeException(nameof(destination), "destination is shorter than p");
        ulong state = _state;
        int k = 0;
        var scale = 1.0 / (1UL << 53);
        if (Vector512.IsHardwareAccelerated && Bmi2.X64.IsSupported)
        {
            var step = Vector512.Create(Increment, unchecked(2 * Increment), unchecked(3 * Increment),
                unchecked(4 * Increment), unchecked(5 * Increment), unchecked(6 * Increment), unchecked(7 * Increment),
                unchecked(8 * Increment));
            for (; k <= p.Length - 8; k += 8)
            {
                var z = Vector512.Create(state) + step;
                state += unchecked(8 * Increment);
                z = (z ^ Vector512.ShiftRightLogical(z, 30)) * Vector512.Create(0xBF58476D1CE4E5B9UL);
                z = (z ^ Vector512.ShiftRightLogical(z, 27)) * Vector512.Create(0x94D049BB133111EBUL);
                z ^= Vector512.ShiftRightLogical(z, 31);
                var u = Vector512.ConvertToDouble(Vector512.ShiftRightLogical(z, 11)) * scale; // exact: 53 bits
                ulong on = Vector512.LessThan(u, Vector512.Create(p.Slice(k, 8))).ExtractMostSignificantBits();
                // Bit l of the mask to byte l (0 or 1) of one little-endian word.
                BinaryPrimitives.WriteUInt64LittleEndian(destination.Slice(k, 8),
                    Bmi2.X64.ParallelBitDeposit(on, 0x0101010101010101UL));
            }
        }
        else if (Vector256.IsHardwareAccelerated)
        {
            var step = Vector256.Create(Increment, unchecked(2 * Increment), unchecked(3 * Increment),
                unchecked(4 * Increment));
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
            double u = (Emit.Reference.Xoshiro256.SplitMix64(ref state) >> 11) * scale;
            destination[k] = u < p[k] ? (byte)1 : (byte)0;
        }
        _state = state;
    }

    /// <summary>
    /// True with probability <paramref name="p"/> (one draw, even when p is 0 or 1, so streams stay aligned).
    /// </summary>
    public bool Chance(double p) => NextDouble() < p;
}
