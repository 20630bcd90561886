using Emit.Training;

namespace Emit.Tests.Training;

public sealed class SplitMix64Tests
{
    // Reference outputs for seed 1234567: Rosetta Code, task "Pseudo-random numbers/Splitmix64" (first five
    // outputs). Reproduced independently by compiling Vigna's public-domain splitmix64.c (prng.di.unimi.it; its
    // next() typed from memory) with gcc -std=c99 and printing the first five outputs for x = 1234567.
    [Fact]
    public void Matches_the_published_outputs_for_seed_1234567()
    {
        var rng = new SplitMix64(1234567);
        ulong[] expected = [6457827717110365317, 3203168211198807973, 9817491932198370423, 4593380528125082431, 16408922859458223821];
        foreach (var e in expected) Assert.Equal(e, rng.Next());
    }

    // Seed 0: first output 0xE220A8397B1DCDAF, from the same gcc run of splitmix64.c (also the value several
    // independent ports of the algorithm test against).
    [Fact]
    public void Matches_the_reference_implementation_for_seed_0()
    {
        Assert.Equal(0xE220A8397B1DCDAFUL, new SplitMix64(0).Next());
    }

    // The double conversion (x >> 11) * 2^-53 is the one recommended beside the reference generators
    // (prng.di.unimi.it, "Generating uniform doubles in the unit interval"); the value is from the gcc run above,
    // printf("%.17g", (next() >> 11) * 0x1.0p-53) for seed 1234567.
    [Fact]
    public void Doubles_are_the_top_53_bits()
    {
        Assert.Equal(0.35007954202140812, new SplitMix64(1234567).NextDouble());
        var rng = new SplitMix64(99);
        for (int k = 0; k < 10000; k++)
        {
            double d = rng.NextDouble();
            Assert.InRange(d, 0.0, 1.0 - 1.0 / (1UL << 53));
        }
    }

    // Uniformity of NextBelow: Pearson's chi-square over the bins, 100000 draws, against the 0.999 quantile of
    // chi-square (scipy.stats.chi2.ppf(0.999, df) from Debian python3-scipy: 27.877 for df 9, 22.458 for df 6).
    // Fixed seed, so the test is repeatable.
    [Theory]
    [InlineData(10)]
    [InlineData(7)]
    public void NextBelow_is_in_range_and_uniform(int bound)
    {
        var rng = new SplitMix64(2024);
        var counts = new int[bound];
        const int draws = 100000;
        for (int k = 0; k < draws; k++) counts[rng.NextBelow(bound)]++;
        double expected = (double)draws / bound;
        double chi2 = counts.Sum(c => (c - expected) * (c - expected) / expected);
        double critical = bound == 10 ? 27.877 : 22.458;
        Assert.True(chi2 < critical, $"chi-square {chi2:F2} with {bound - 1} degrees of freedom");
        Assert.Equal(0, new SplitMix64(5).NextBelow(1));
        Assert.Throws<ArgumentOutOfRangeException>(() => rng.NextBelow(0));
    }

    [Fact]
    public void Same_seed_same_stream_and_chance_always_draws()
    {
        var a = new SplitMix64(7);
        var b = new SplitMix64(7);
        Assert.False(a.Chance(0.0));
        Assert.True(a.Chance(1.0));
        b.Next();
        b.Next();
        Assert.Equal(b.Next(), a.Next()); // Chance(0) and Chance(1) each consumed one output
    }

    // Bernoulli is the loop "NextDouble() < p" with the state in a local: same draws, same results, same state after.
    [Fact]
    public void Bernoulli_is_the_draw_by_draw_loop()
    {
        var p = new double[1001];
        var source = new SplitMix64(5);
        for (int k = 0; k < p.Length; k++) p[k] = k % 7 == 0 ? 0.0 : k % 11 == 0 ? 1.0 : source.NextDouble();
        var a = new SplitMix64(77);
        var b = new SplitMix64(77);
        var bits = new byte[p.Length];
        a.Bernoulli(p, bits);
        for (int k = 0; k < p.Length; k++) Assert.Equal(b.NextDouble() < p[k] ? 1 : 0, bits[k]);
        Assert.Equal(b.Next(), a.Next());
        Assert.InRange(bits.Count(x => x == 1), 400, 600);
    }

    // Every short length, so the eight-lane, four-lane and one-at-a-time paths each meet the start and the end.
    [Fact]
    public void Bernoulli_is_the_draw_by_draw_loop_at_every_short_length()
    {
        var source = new SplitMix64(6);
        for (int n = 0; n <= 40; n++)
        {
            var p = new double[n];
            for (int k = 0; k < n; k++) p[k] = source.NextDouble();
            var a = new SplitMix64((ulong)n);
            var b = new SplitMix64((ulong)n);
            var bits = new byte[n + 8];
            Array.Fill(bits, (byte)7);
            a.Bernoulli(p, bits);
            for (int k = 0; k < n; k++) Assert.Equal(b.NextDouble() < p[k] ? 1 : 0, bits[k]);
            Assert.All(bits.Skip(n), x => Assert.Equal(7, x)); // nothing written past the draws
            Assert.Equal(b.Next(), a.Next());
        }
    }
}
