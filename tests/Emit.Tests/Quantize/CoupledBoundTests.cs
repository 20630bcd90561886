using Emit.Quantize;

namespace Emit.Tests.Quantize;

public sealed class CoupledBoundTests
{
    /// <summary>
    /// Σ_j s_j (δC_j + Σ_i v_i δW_ij) for every binary v and slopes at the corners and inside of their boxes
    /// (enumeration) lies in the stated enclosure, and the enclosure is no wider than the per-unit one.
    /// </summary>
    [Theory]
    [InlineData(10, 4, 1)]
    [InlineData(8, 7, 2)]
    [InlineData(12, 3, 3)]
    public void Enclosure_holds_every_input_and_slope(int v, int h, int seed)
    {
        var rng = new Random(seed);
        var dW = Enumerable.Range(0, v * h).Select(_ => rng.NextDouble() - 0.5).ToArray();
        var dC = Enumerable.Range(0, h).Select(_ => rng.NextDouble() - 0.5).ToArray();
        var sLo = Enumerable.Range(0, h).Select(_ => 0.5 * rng.NextDouble()).ToArray();
        var sHi = sLo.Select(s => s + 0.5 * rng.NextDouble()).ToArray();
        var coupled = CoupledBound.Compute(v, h, dW, dC, sLo, sHi, spectral: true);
        var perUnit = ErrorInterval.Zero;
        for (int j = 0; j < h; j++)
        {
            double neg = 0, pos = 0;
            for (int i = 0; i < v; i++) { double d = dW[i * h + j]; if (d < 0) neg += d; else pos += d; }
            perUnit += new ErrorInterval(sLo[j], sHi[j]).Times(new ErrorInterval(dC[j] + neg, dC[j] + pos));
        }
        Assert.True(coupled.Lo >= perUnit.Lo - 1e-12 && coupled.Hi <= perUnit.Hi + 1e-12);
        var s = new double[h];
        for (long bits = 0; bits < 1L << v; bits++)
        {
            for (int trial = 0; trial < (1 << h) + 4; trial++)
            {
                for (int j = 0; j < h; j++)
                    s[j] = trial < 1 << h ? ((trial >> j) & 1) == 1 ? sHi[j] : sLo[j] : sLo[j] + rng.NextDouble() * (sHi[j] - sLo[j]);
                double total = 0;
                for (int j = 0; j < h; j++)
                {
                    double delta = dC[j];
                    for (int i = 0; i < v; i++) delta += ((bits >> i) & 1) * dW[i * h + j];
                    total += s[j] * delta;
                }
                Assert.True(total >= coupled.Lo - 1e-12 && total <= coupled.Hi + 1e-12, $"{total} outside {coupled}");
            }
        }
    }

    [Fact]
    public void Coupled_form_is_much_tighter_than_per_unit_on_a_wide_layer()
    {
        // Many inputs, many units, independent rounding errors: no input is every unit's worst case.
        int v = 400, h = 200;
        var rng = new Random(7);
        var dW = Enumerable.Range(0, v * h).Select(_ => rng.NextDouble() - 0.5).ToArray();
        var dC = new double[h];
        var sLo = new double[h];
        var sHi = Enumerable.Repeat(1.0, h).ToArray();
        var coupled = CoupledBound.Compute(v, h, dW, dC, sLo, sHi, spectral: true);
        var perUnit = CoupledBound.Compute(v, h, dW, dC, sLo, sHi, spectral: false);
        Assert.True(coupled.Width < 0.4 * perUnit.Width, $"coupled {coupled} vs per unit {perUnit}");
    }
}
