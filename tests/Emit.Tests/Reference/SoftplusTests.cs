using Emit.Reference;

namespace Emit.Tests.Reference;

public sealed class SoftplusTests
{
    // Check values of log(1 + exp(x)), computed with mpmath at 40 digits.
    [Theory]
    [InlineData(-40.0, 4.248354255291588986e-18)]
    [InlineData(-20.0, 2.061153620314380703e-9)]
    [InlineData(0.0, 0.6931471805599453094)]
    [InlineData(1.0, 1.313261687518222834)]
    [InlineData(10.0, 10.00004539889921686)]
    [InlineData(20.0, 20.00000000206115362)]
    public void Matches_high_precision_values(double x, double expected)
    {
        double got = Softplus.Of(x);
        Assert.True(Math.Abs(got - expected) <= 4e-16 * Math.Abs(expected), $"softplus({x}) = {got:R}, expected {expected:R}");
    }

    [Fact]
    public void Never_overflows_and_is_exact_in_the_tails()
    {
        Assert.Equal(1000.0, Softplus.Of(1000.0));
        Assert.Equal(0.0, Softplus.Of(-1000.0));
        Assert.Equal(Math.Exp(-700), Softplus.Of(-700));
    }

    // log1p reference: for tiny x, log(1+x) = x - x²/2 + x³/3 (Taylor series, standard calculus).
    [Theory]
    [InlineData(1e-10)]
    [InlineData(-3e-9)]
    [InlineData(8.5e-17)]
    public void Log1P_is_accurate_for_tiny_arguments(double x)
    {
        double series = x - x * x / 2 + x * x * x / 3;
        Assert.True(Math.Abs(Softplus.Log1P(x) - series) <= 2e-16 * Math.Abs(series));
    }
}
