using System.Globalization;
using Emit.Detection;

namespace Emit.Tests.Detection;

/// <summary>
/// The exact binomial interval against scipy.stats.beta.ppf (Debian python3-scipy 1.10.1; fixture made by
/// tests/reference/make_detection_fixtures.py, versions in Fixtures/detection_versions.json), and against the closed
/// forms of the one-sided cases (Clopper &amp; Pearson 1934: with x = 0 the upper bound solves (1 − p)^n = α/2).
/// </summary>
public sealed class ClopperPearsonTests
{
    internal static string Fixture(string name) => Path.Combine(AppContext.BaseDirectory, "Detection", "Fixtures", name);

    public static TheoryData<long, long, double, double, double> ScipyCases()
    {
        var data = new TheoryData<long, long, double, double, double>();
        foreach (var line in File.ReadLines(Fixture("clopper_pearson.csv")).Skip(1))
        {
            var f = line.Split(',');
            double D(int k) => double.Parse(f[k], CultureInfo.InvariantCulture);
            data.Add(long.Parse(f[0], CultureInfo.InvariantCulture), long.Parse(f[1], CultureInfo.InvariantCulture), D(2), D(3), D(4));
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(ScipyCases))]
    public void Interval_matches_scipy_beta_ppf(long x, long n, double confidence, double low, double high)
    {
        var i = ClopperPearson.Interval(x, n, confidence);
        AssertClose(low, i.Low);
        AssertClose(high, i.High);
        Assert.Equal(confidence, i.Confidence);
    }

    [Theory]
    [InlineData(10)]
    [InlineData(2000)]
    [InlineData(1_000_000)]
    public void Zero_and_all_successes_have_closed_forms(long n)
    {
        var none = ClopperPearson.Interval(0, n);
        Assert.Equal(0, none.Low);
        AssertClose(1 - Math.Pow(0.025, 1.0 / n), none.High);
        var all = ClopperPearson.Interval(n, n);
        AssertClose(Math.Pow(0.025, 1.0 / n), all.Low);
        Assert.Equal(1, all.High);
    }

    [Fact]
    public void Impossible_counts_are_refused()
    {
        Assert.Throws<EmitException>(() => ClopperPearson.Interval(3, 2));
        Assert.Throws<EmitException>(() => ClopperPearson.Interval(0, 0));
        Assert.Throws<EmitException>(() => ClopperPearson.Interval(1, 2, 1.0));
    }

    private static void AssertClose(double expected, double actual)
    {
        double tol = 1e-9 * Math.Abs(expected) + 1e-300;
        Assert.True(Math.Abs(expected - actual) <= tol, $"expected {expected:R}, got {actual:R}");
    }
}
