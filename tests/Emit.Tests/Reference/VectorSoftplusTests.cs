using System.Runtime.Intrinsics;
using Emit.Reference;
using Xunit.Abstractions;

namespace Emit.Tests.Reference;

/// <summary>
/// The libm-free vector softplus against the C runtime's exp and log (through Math.Exp, Math.Log and the
/// libm-based <see cref="Softplus"/>) over the whole double range, and against high-precision values.
/// </summary>
public sealed class VectorSoftplusTests(ITestOutputHelper output)
{
    /// <summary>Distance in ulps between two non-negative doubles (their bit patterns are ordered).</summary>
    private static long Ulps(double a, double b) =>
        Math.Abs(BitConverter.DoubleToInt64Bits(a) - BitConverter.DoubleToInt64Bits(b));

    /// <summary>Magnitudes spread evenly in log scale from 10^lo to 10^hi, plus the given points.</summary>
    private static IEnumerable<double> LogSpread(double lo, double hi, int count, int seed)
    {
        var rng = new Random(seed);
        for (int k = 0; k < count; k++) yield return Math.Pow(10, lo + (hi - lo) * rng.NextDouble());
    }

    private static double Lane(Func<Vector512<double>, Vector512<double>> f, double x) =>
        f(Vector512.Create(x)).ToScalar();

    [Fact]
    public void Exp_of_non_positive_arguments_is_within_two_ulps_of_Math_Exp()
    {
        // glibc's exp is within 1 ulp (its manual's libm error table); fdlibm's is within 1 ulp (e_exp.c).
        var ys = LogSpread(-310, Math.Log10(745.1), 200_000, 1).Select(m => -m)
            .Concat([0.0, -0.5 * Math.Log(2), -1.5 * Math.Log(2), -1, -20, -37, -700, -708.39, -708.4, -709,
                     -720, -740, -744.4, -745.1, -745.13])
            .Concat(Enumerable.Range(0, 20_000).Select(k => -k * 0.03725));
        long worst = 0;
        foreach (double y in ys)
        {
            long d = Ulps(Lane(VectorSoftplus.ExpNonPositive, y), Math.Exp(y));
            Assert.True(d <= 2, $"exp({y:R}): {Lane(VectorSoftplus.ExpNonPositive, y):R} vs {Math.Exp(y):R}");
            worst = Math.Max(worst, d);
        }
        output.WriteLine($"exp: largest difference from Math.Exp {worst} ulp");
        Assert.Equal(0.0, Lane(VectorSoftplus.ExpNonPositive, -746));
        Assert.Equal(0.0, Lane(VectorSoftplus.ExpNonPositive, -1e6));
        Assert.Equal(0.0, Lane(VectorSoftplus.ExpNonPositive, double.NegativeInfinity));
    }

    [Fact]
    public void Log1P_on_the_unit_interval_is_within_two_ulps_of_a_compensated_Math_Log()
    {
        // Reference: log(u) + (t − (u − 1))/u with u = 1 + t rounded, Math.Log within 1 ulp (glibc), the
        // correction exact to first order (Goldberg 1991, Theorem 4's argument).
        static double Reference(double t)
        {
            double u = 1 + t;
            return u == 1 ? t : Math.Log(u) + (t - (u - 1)) / u;
        }
        var ts = LogSpread(-320, 0, 200_000, 2).Where(t => t <= 1)
            .Concat([0.0, 1.0, 0.41421356237309503, 0.4142135623730951, 0.41421356237309515, 1e-300, 5e-324])
            .Concat(Enumerable.Range(0, 20_001).Select(k => k / 20_000.0));
        long worst = 0;
        foreach (double t in ts)
        {
            double got = Lane(VectorSoftplus.Log1PUnit, t), want = Reference(t);
            Assert.True(Ulps(got, want) <= 2, $"log1p({t:R}): {got:R} vs {want:R}");
            worst = Math.Max(worst, Ulps(got, want));
        }
        output.WriteLine($"log1p: largest difference from the compensated Math.Log {worst} ulp");
    }

    [Fact]
    public void Softplus_is_within_four_ulps_of_the_libm_softplus_over_the_whole_range()
    {
        var xs = LogSpread(-300, 3, 200_000, 3).SelectMany(m => new[] { m, -m })
            .Concat(Enumerable.Range(-40_000, 80_001).Select(k => k * 0.001))
            .Concat([0.0, -0.0, 18, 18.000001, 33.3, 33.31, 37, -37, -37.01, 708.4, -708.4, -745, 745]);
        long worst = 0;
        double worstRel = 0;
        foreach (double x in xs)
        {
            double got = VectorSoftplus.Of(x), want = Softplus.Of(x);
            Assert.True(Ulps(got, want) <= 4, $"softplus({x:R}): {got:R} vs libm {want:R}");
            worst = Math.Max(worst, Ulps(got, want));
            if (want > 0) worstRel = Math.Max(worstRel, Math.Abs(got - want) / want);
        }
        output.WriteLine($"softplus: largest difference from Softplus.Of {worst} ulp, relative {worstRel:E2}");
    }

    // log(1 + exp(x)) computed with mpmath at 40 digits (the values of SoftplusTests), and further points:
    // for x ≥ 37 the value rounds to x; for x ≤ −37 it is e^x to double precision.
    [Theory]
    [InlineData(-40.0, 4.248354255291588986e-18)]
    [InlineData(-20.0, 2.061153620314380703e-9)]
    [InlineData(0.0, 0.6931471805599453094)]
    [InlineData(1.0, 1.313261687518222834)]
    [InlineData(10.0, 10.00004539889921686)]
    [InlineData(20.0, 20.00000000206115362)]
    [InlineData(40.0, 40.0)]
    [InlineData(1e300, 1e300)]
    public void Matches_high_precision_values(double x, double expected)
    {
        double got = VectorSoftplus.Of(x);
        Assert.True(Math.Abs(got - expected) <= 4e-16 * Math.Abs(expected),
            $"softplus({x}) = {got:R}, expected {expected:R}");
    }

    [Fact]
    public void Infinities_and_NaN()
    {
        Assert.Equal(double.PositiveInfinity, VectorSoftplus.Of(double.PositiveInfinity));
        Assert.Equal(0.0, VectorSoftplus.Of(double.NegativeInfinity));
        Assert.True(double.IsNaN(VectorSoftplus.Of(double.NaN)));
        Assert.Equal(0.0, VectorSoftplus.Of(-1000.0));
        Assert.Equal(Math.Exp(-700), VectorSoftplus.Of(-700), 1e-318);
    }

    [Fact]
    public void Sum_keeps_eight_partial_sums_in_a_fixed_order_and_matches_the_plain_sum()
    {
        var rng = new Random(4);
        for (int n = 0; n <= 41; n++)
        {
            var x = Enumerable.Range(0, n).Select(_ => (rng.NextDouble() - 0.5) * 60).ToArray();
            // The documented order, written out: lane l sums j ≡ l (mod 8) in order, then ((0+4)+(2+6))+((1+5)+(3+7)).
            var lane = new double[8];
            for (int j = 0; j < n; j++) lane[j % 8] += VectorSoftplus.Of(x[j]);
            double expected = ((lane[0] + lane[4]) + (lane[2] + lane[6])) + ((lane[1] + lane[5]) + (lane[3] + lane[7]));
            Assert.Equal(BitConverter.DoubleToInt64Bits(expected),
                BitConverter.DoubleToInt64Bits(VectorSoftplus.Sum(x)));
            double plain = x.Sum(Softplus.Of);
            Assert.True(Math.Abs(plain - VectorSoftplus.Sum(x)) <= 1e-14 * Math.Max(1, Math.Abs(plain)), $"n = {n}");
        }
    }

    /// <summary>
    /// The 256-bit kernel that <see cref="VectorSoftplus.Sum"/> uses where 512-bit vectors are not accelerated gives
    /// the 512-bit kernel's bits in every lane, over arguments spread across the whole double range, the edges of the
    /// exponential's range, the log1p reduction's switch point, zeros, infinities and NaN.
    /// </summary>
    [Fact]
    public void The_256_bit_kernel_gives_the_512_bit_kernels_bits()
    {
        var rng = new Random(256);
        var special = new[] { 0.0, -0.0, 1e-300, -1e-300, 745.0, -745.0, 746.0, -746.0, 709.7, -709.7, 0.8813735870195430,
            -0.8813735870195430, double.MaxValue, double.MinValue, double.PositiveInfinity, double.NegativeInfinity,
            double.NaN, double.Epsilon, 36.7, -36.7 };
        var values = special.Concat(Enumerable.Range(0, 40000).Select(_ =>
            (rng.NextDouble() < 0.5 ? -1 : 1) * Math.ScaleB(1 + rng.NextDouble(), rng.Next(-40, 12)))).ToArray();
        for (int i = 0; i + 8 <= values.Length; i += 8)
        {
            var wide = VectorSoftplus.Of(Vector512.Create(values.AsSpan(i, 8)));
            var low = VectorSoftplus.Of(Vector256.Create(values.AsSpan(i, 4)));
            var high = VectorSoftplus.Of(Vector256.Create(values.AsSpan(i + 4, 4)));
            for (int l = 0; l < 8; l++)
            {
                double a = wide.GetElement(l), b = l < 4 ? low.GetElement(l) : high.GetElement(l - 4);
                Assert.True(BitConverter.DoubleToInt64Bits(a) == BitConverter.DoubleToInt64Bits(b),
                    $"softplus({values[i + l]:R}): 512-bit {a:R}, 256-bit {b:R}");
            }
        }
    }
}
