namespace Emit.Training;

/// <summary>
/// SplitMix64 pseudo-random generator (Steele, Lea and Flood, "Fast splittable pseudorandom number generators",
/// OOPSLA 2014; the 64-bit finaliser constants of Vigna's public-domain splitmix64.c). Our own implementation so
/// the demo data and the trainer never depend on <see cref="System.Random"/>, whose sequence may change between .NET
/// versions. Integer arithmetic only: the same seed gives the same sequence on every platform.
/// </summary>
public sealed class SplitMix64
{
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
    /// True with probability <paramref name="p"/> (one draw, even when p is 0 or 1, so streams stay aligned).
    /// </summary>
    public bool Chance(double p) => NextDouble() < p;
}
