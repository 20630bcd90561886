namespace Emit.Reference;

/// <summary>
/// xoshiro256** pseudo-random generator (Blackman and Vigna, "Scrambled linear pseudorandom number generators",
/// 2021), seeded through SplitMix64 as its authors recommend. Used instead of System.Random so sampled
/// results are the same on every .NET version.
/// </summary>
public sealed class Xoshiro256
{
    private ulong _s0, _s1, _s2, _s3;

    /// <summary>
    /// A generator whose four state words are drawn from SplitMix64 started at <paramref name="seed"/>.
    /// </summary>
    public Xoshiro256(ulong seed)
    {
        ulong x = seed;
        _s0 = SplitMix64(ref x);
        _s1 = SplitMix64(ref x);
        _s2 = SplitMix64(ref x);
        _s3 = SplitMix64(ref x);
    }

    /// <summary>
    /// One SplitMix64 step (Steele, Lea and Flood 2014): advances <paramref name="x"/> and returns the output.
    /// </summary>
    public static ulong SplitMix64(ref ulong x)
    {
        ulong z = x += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    /// <summary>The next 64 random bits.</summary>
    public ulong NextUInt64()
    {
        ulong result = ulong.RotateLeft(_s1 * 5, 7) * 9;
        ulong t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = ulong.RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>Uniform in [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (NextUInt64() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Uniform integer in [0, n) (Lemire's multiply-shift; the tiny bias is irrelevant here).</summary>
    public int NextInt(int n) => (int)(((NextUInt64() >> 32) * (ulong)n) >> 32);

    /// <summary>True with probability σ(x) = 1/(1 + e^−x).</summary>
    public bool Bernoulli(double logit) => NextDouble() < Softplus.Sigmoid(logit);
}
