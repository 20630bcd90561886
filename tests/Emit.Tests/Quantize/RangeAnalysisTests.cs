using Emit.Model;
using Emit.Quantize;
using Emit.Tests.Reference;

namespace Emit.Tests.Quantize;

/// <summary>The range analysis against brute-force enumeration of every binary input.</summary>
public sealed class RangeAnalysisTests
{
    [Theory]
    [InlineData(ModelKind.Rbm, 8, 5)]
    [InlineData(ModelKind.Lateral, 9, 4)]
    [InlineData(ModelKind.General, 7, 3)]
    public void Ranges_match_enumeration(ModelKind kind, int v, int h)
    {
        for (int seed = 0; seed < 5; seed++)
        {
            var m = TestModels.Random(kind, v, h, 100 + seed, scale: 1.3, linkDensity: 0.5);
            var ra = RangeAnalysis.Of(m);
            var lo = Enumerable.Repeat(double.MaxValue, h).ToArray();
            var hi = Enumerable.Repeat(double.MinValue, h).ToArray();
            double bLo = double.MaxValue, bHi = double.MinValue;
            for (long bits = 0; bits < 1L << v; bits++)
            {
                var u = TestModels.Bits(bits, v);
                for (int j = 0; j < h; j++)
                {
                    double x = m.HiddenBias[j];
                    for (int i = 0; i < v; i++) x += u[i] * m.Weight(i, j);
                    lo[j] = Math.Min(lo[j], x);
                    hi[j] = Math.Max(hi[j], x);
                }
                double b = 0;
                for (int i = 0; i < v; i++) b += u[i] * m.VisibleBias[i];
                bLo = Math.Min(bLo, b);
                bHi = Math.Max(bHi, b);
                double lat = m.VisibleLinks.Sum(l => l.W * u[l.I] * u[l.J]);
                Assert.True(ra.LateralTerm.Contains(lat), "lateral term outside its enclosure");
                double f = BruteForce.FreeEnergy(m, u);
                Assert.True(ra.FreeEnergy.Min - 1e-9 <= f && f <= ra.FreeEnergy.Max + 1e-9, $"F = {f} outside {ra.FreeEnergy}");
            }
            for (int j = 0; j < h; j++)
            {
                // Exact: both ends are attained.
                Assert.Equal(lo[j], ra.Hidden[j].Min, 12);
                Assert.Equal(hi[j], ra.Hidden[j].Max, 12);
                double atMax = m.HiddenBias[j], atMin = m.HiddenBias[j];
                var up = ra.MaximisingVector(j);
                var down = ra.MinimisingVector(j);
                for (int i = 0; i < v; i++)
                {
                    atMax += up[i] * m.Weight(i, j);
                    atMin += down[i] * m.Weight(i, j);
                }
                Assert.Equal(hi[j], atMax, 12);
                Assert.Equal(lo[j], atMin, 12);
            }
            Assert.Equal(bLo, ra.VisibleBiasTerm.Min, 12);
            Assert.Equal(bHi, ra.VisibleBiasTerm.Max, 12);
        }
    }
}
