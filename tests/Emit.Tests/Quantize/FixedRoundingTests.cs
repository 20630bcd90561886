using Emit.Quantize;

namespace Emit.Tests.Quantize;

public sealed class FixedRoundingTests
{
    // Outside reference: .NET's Math.Round with MidpointRounding.AwayFromZero (documented: "when a number is halfway
    // between two others, it is rounded toward the nearest number that is away from zero").
    [Theory]
    [InlineData(0.5, 0, 1)]
    [InlineData(-0.5, 0, -1)]
    [InlineData(2.5, 0, 3)]
    [InlineData(-2.5, 0, -3)]
    [InlineData(0.49999999999999994, 0, 0)]
    [InlineData(0.3, 4, 5)]      // 0.3 · 16 = 4.8
    [InlineData(-0.3, 4, -5)]
    [InlineData(1.0 / 32, 4, 1)] // 0.5 exactly: away from zero
    public void Quantize_rounds_half_away_from_zero(double x, int bits, long expected) =>
        Assert.Equal((Int128)expected, FixedRounding.Quantize(x, bits));

    [Fact]
    public void Rescale_matches_exact_division_rounded_half_away_from_zero()
    {
        for (int s = 1; s <= 6; s++)
            for (long x = -300; x <= 300; x++)
            {
                long expected = (long)Math.Round(x / Math.ScaleB(1.0, s), MidpointRounding.AwayFromZero);
                Assert.Equal((Int128)expected, FixedRounding.Rescale(x, s));
            }
        for (int s = 0; s >= -5; s--)
            for (long x = -50; x <= 50; x++) Assert.Equal((Int128)(x * (1L << -s)), FixedRounding.Rescale(x, s));
    }

    [Fact]
    public void Drop_bits_error_interval_holds_the_actual_errors_and_is_attained()
    {
        for (int s = 1; s <= 6; s++)
        {
            var pos = FixedRounding.DropBitsError(s, nonNegative: true);
            var neg = FixedRounding.DropBitsError(s, nonNegative: false);
            double lo = double.MaxValue, hi = double.MinValue, nlo = double.MaxValue, nhi = double.MinValue;
            for (long x = 0; x <= 1000; x++)
            {
                double err = (double)FixedRounding.Rescale(x, s) - x / Math.ScaleB(1.0, s);
                lo = Math.Min(lo, err); hi = Math.Max(hi, err);
                double nerr = (double)FixedRounding.Rescale(-x, s) + x / Math.ScaleB(1.0, s);
                nlo = Math.Min(nlo, nerr); nhi = Math.Max(nhi, nerr);
            }
            Assert.Equal(pos.Lo, lo, 12);
            Assert.Equal(pos.Hi, hi, 12);
            Assert.Equal(neg.Lo, nlo, 12);
            Assert.Equal(neg.Hi, nhi, 12);
        }
        Assert.Equal(ErrorInterval.Zero, FixedRounding.DropBitsError(0, true));
    }
}
