using Emit.Detection;

namespace Emit.Tests.Detection;

/// <summary>
/// The conformal order statistic (Vovk, Gammerman &amp; Shafer 2005): t = the k-th smallest of n normal free energies,
/// k = ⌈(n + 1)(1 − A)⌉, checked against a brute-force reading of that definition in exact integer arithmetic,
/// and its guarantee P(F_new &gt; t) ≤ A checked by simulation on exchangeable (independent, identically distributed) data.
/// </summary>
public sealed class ConformalThresholdTests
{
    // A written as a fraction p/q so that (n + 1)(1 − A) is exact: k is the smallest integer with k·q ≥ (n + 1)(q − p).
    private static readonly (double A, long P, long Q)[] Rates =
        [(0.1, 1, 10), (0.05, 1, 20), (0.01, 1, 100), (0.005, 1, 200), (0.001, 1, 1000), (0.25, 1, 4), (0.3, 3, 10), (0.57, 57, 100), (0.07, 7, 100)];

    [Fact]
    public void Rank_is_the_smallest_integer_at_or_above_n_plus_1_times_1_minus_A()
    {
        foreach (var (a, p, q) in Rates)
            for (long n = 1; n <= 2500; n++)
            {
                long need = (n + 1) * (q - p);
                long k = (need + q - 1) / q;
                if (k > n)
                    Assert.Throws<EmitException>(() => ConformalThreshold.Rank(n, a));
                else
                    Assert.Equal(k, ConformalThreshold.Rank(n, a));
                Assert.Equal(k <= n, ConformalThreshold.Enough(n, a));
            }
    }

    [Fact]
    public void Threshold_is_the_kth_smallest_value_by_counting()
    {
        var rng = new Random(7);
        for (int trial = 0; trial < 200; trial++)
        {
            int n = rng.Next(10, 400);
            // values with ties: rounded to a coarse grid
            var xs = Enumerable.Range(0, n).Select(_ => Math.Round(rng.NextDouble() * 20) / 2).ToArray();
            double a = new[] { 0.1, 0.05, 0.25 }[trial % 3];
            long k = ConformalThreshold.Rank(n, a);
            double t = ConformalThreshold.Threshold(xs, a);
            // brute force: t is a value of the set with at least k values <= t and fewer than k values < t
            Assert.Contains(t, xs);
            Assert.True(xs.Count(x => x <= t) >= k);
            Assert.True(xs.Count(x => x < t) < k);
        }
    }

    [Fact]
    public void Too_little_data_is_refused_with_the_number_needed()
    {
        var e = Assert.Throws<EmitException>(() => ConformalThreshold.Rank(50, 0.01));
        Assert.Contains("at least 99 normal vectors", e.OneLine());
        Assert.Equal(99, ConformalThreshold.MinimumVectors(0.01));
        Assert.Equal(999, ConformalThreshold.MinimumVectors(0.001));
        Assert.Equal(9, ConformalThreshold.MinimumVectors(0.1));
        Assert.Equal(99, ConformalThreshold.Rank(99, 0.01));
        Assert.Throws<EmitException>(() => ConformalThreshold.Rank(100, 0));
        Assert.Throws<EmitException>(() => ConformalThreshold.Rank(100, 1));
        Assert.Throws<EmitException>(() => ConformalThreshold.Rank(100, double.NaN));
    }

    // The guarantee: for n + 1 exchangeable values, the chance that the last exceeds the threshold set on the first n
    // is (n + 1 − k)/(n + 1) ≤ A. 40000 simulated calibrations; the estimate must lie within 4.5 standard errors of
    // the exact value (a failure by chance has probability about 1e-5, and the seed is fixed).
    [Theory]
    [InlineData(19, 0.1)]
    [InlineData(99, 0.05)]
    [InlineData(150, 0.01)]
    public void A_new_exchangeable_value_exceeds_the_threshold_with_probability_at_most_A(int n, double a)
    {
        var rng = new Random(20261202 + n);
        const int trials = 40000;
        int above = 0;
        var xs = new double[n];
        for (int t = 0; t < trials; t++)
        {
            for (int i = 0; i < n; i++) xs[i] = rng.NextDouble();
            if (rng.NextDouble() > ConformalThreshold.Threshold(xs, a)) above++;
        }
        long k = ConformalThreshold.Rank(n, a);
        double exact = (n + 1 - k) / (double)(n + 1);
        Assert.True(exact <= a + 1e-12);
        double se = Math.Sqrt(exact * (1 - exact) / trials);
        double estimate = above / (double)trials;
        Assert.True(Math.Abs(estimate - exact) < 4.5 * se, $"estimate {estimate}, exact {exact}, se {se}");
    }
}
