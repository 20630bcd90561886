using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Quantize;

public sealed class FloatErrorBoundTests
{
    /// <summary>γ_n = n·u/(1 − n·u) (Higham 2002, Lemma 3.1); u = 2^−24 and 2^−53 (IEEE 754 binary32/binary64, round to nearest).</summary>
    [Fact]
    public void Gamma_and_unit_roundoff_follow_the_textbook_definitions()
    {
        Assert.Equal(Math.Pow(2, -24), FloatErrorBound.UnitRoundoff(NumericMode.F32));
        Assert.Equal(Math.Pow(2, -53), FloatErrorBound.UnitRoundoff(NumericMode.F64));
        double u = Math.Pow(2, -24);
        Assert.Equal(10 * u / (1 - 10 * u), FloatErrorBound.Gamma(10, u));
        Assert.Equal(0.0, FloatErrorBound.Gamma(0, u));
        Assert.True(double.IsPositiveInfinity(FloatErrorBound.Gamma(1L << 24, u)));
    }

    [Theory]
    [InlineData(ModelKind.Rbm)]
    [InlineData(ModelKind.Lateral)]
    [InlineData(ModelKind.General)]
    public void The_worst_case_bound_covers_every_input_and_f32_is_looser_than_f64(ModelKind kind)
    {
        var m = TestModels.Random(kind, 10, 5, seed: 9);
        foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
        {
            double worst = FloatErrorBound.Worst(m, mode);
            for (long bits = 0; bits < 1 << m.Visible; bits += 7)
                Assert.True(FloatErrorBound.ForVector(m, mode, TestModels.Bits(bits, m.Visible)) <= worst);
        }
        Assert.True(FloatErrorBound.Worst(m, NumericMode.F32) > 1e6 * FloatErrorBound.Worst(m, NumericMode.F64));
    }
}
