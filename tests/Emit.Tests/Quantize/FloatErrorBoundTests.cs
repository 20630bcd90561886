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

    /// <summary>
    /// The streamed pre-activations of an f32 scorer (c_j, then a row added or subtracted at each toggle: the units of
    /// the input from all off, then the flips), replayed here in float arithmetic, stay within γ_(k + f)·(|c_j| +
    /// Σ_i |W_ij|) of the exact value of the same stored coefficients after k rows and f flips: the bound by partial
    /// sums (Higham 2002, §4.2 and Lemma 3.1) that <see cref="FloatErrorBound.StreamWorst"/> uses, since every partial
    /// sum is the pre-activation of some binary input. The walks are built to accumulate rounding: weights spread over
    /// 2^−10 .. 2^10, and most flips toggle the unit with the largest weight, so large values are added and taken off
    /// again many times. The exact values are double sums of floats within 2^−34 .. 2^17, which double holds exactly.
    /// </summary>
    [Fact]
    public void Streamed_pre_activations_stay_within_the_partial_sum_bound_on_walks_that_pile_up_rounding()
    {
        const int visible = 40, flips = 64;
        double u = FloatErrorBound.UnitRoundoff(NumericMode.F32), largestSeen = 0;
        var rng = new Random(71);
        for (int model = 0; model < 20; model++)
        {
            var w = new float[visible];
            for (int i = 0; i < visible; i++)
                w[i] = (float)((rng.NextDouble() < 0.5 ? -1 : 1) * Math.ScaleB(1 + rng.NextDouble(), rng.Next(-10, 10)));
            float c = (float)(-Math.ScaleB(1 + rng.NextDouble(), 9));
            double s = Math.Abs((double)c);
            foreach (var x in w) s += Math.Abs((double)x);
            int big = Array.IndexOf(w, w.MaxBy(Math.Abs));
            for (int walk = 0; walk < 50; walk++)
            {
                var on = new bool[visible];
                float acc = c;
                double exact = c;
                int k = 0;
                for (int i = 0; i < visible; i++)
                    if (rng.NextDouble() < 0.5) { on[i] = true; acc += w[i]; exact += w[i]; k++; }
                for (int f = 1; f <= flips; f++)
                {
                    int i = rng.NextDouble() < 0.7 ? big : rng.Next(visible);
                    on[i] = !on[i];
                    if (on[i]) { acc += w[i]; exact += w[i]; } else { acc -= w[i]; exact -= w[i]; }
                    double error = Math.Abs(acc - exact), bound = FloatErrorBound.Gamma(k + f, u) * s;
                    Assert.True(error <= bound, $"model {model}, walk {walk}, flip {f}: error {error:R} > {bound:R}");
                    largestSeen = Math.Max(largestSeen, error / bound);
                }
            }
        }
        Assert.True(largestSeen > 0.01, $"the walks never came near the bound (at most {largestSeen:P2} of it)");
    }
}
