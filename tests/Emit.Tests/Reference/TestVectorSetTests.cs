using Emit.Model;
using Emit.Reference;

namespace Emit.Tests.Reference;

public sealed class TestVectorSetTests
{
    private static BoltzmannModel WithThreshold(BoltzmannModel m)
    {
        // A threshold in the middle of the model's own sample distribution, so both sides occur.
        var scorer = new ReferenceScorer(m);
        var f = TestVectorSet.Generate(m, new TestVectorOptions(200, 4)).Select(x => scorer.FreeEnergy(x.Units)).Order().ToList();
        return m.With(f[f.Count / 2], null);
    }

    [Fact]
    public void Same_seed_same_vectors_and_exact_count()
    {
        var m = WithThreshold(TestModels.Random(ModelKind.Lateral, 20, 6, 3));
        var a = TestVectorSet.Generate(m, new TestVectorOptions(100, 7));
        var b = TestVectorSet.Generate(m, new TestVectorOptions(100, 7));
        Assert.Equal(100, a.Count);
        Assert.Equal(a.Select(x => Convert.ToHexString(x.Units)), b.Select(x => Convert.ToHexString(x.Units)));
        Assert.Contains(a, x => x.Origin == VectorOrigin.Sample);
        Assert.Contains(a, x => x.Origin == VectorOrigin.NearThreshold);
    }

    [Fact]
    public void Unit_extremes_reach_each_hidden_units_exact_input_range()
    {
        var m = TestModels.Random(ModelKind.Rbm, 12, 5, 9);
        var set = TestVectorSet.Generate(m, new TestVectorOptions(40, 1));
        var ranges = ModelStatistics.HiddenRanges(m);
        var max = set.Where(x => x.Origin == VectorOrigin.UnitMaximiser).ToList();
        var min = set.Where(x => x.Origin == VectorOrigin.UnitMinimiser).ToList();
        Assert.Equal(5, max.Count);
        for (int j = 0; j < 5; j++)
        {
            double Input(byte[] v) => m.HiddenBias[j] + Enumerable.Range(0, 12).Sum(i => v[i] * m.Weight(i, j));
            // Brute force over all 2^12 vectors: the extreme vectors attain the true extremes.
            double lo = double.MaxValue, hi = double.MinValue;
            for (int bits = 0; bits < 1 << 12; bits++) { double x = Input(TestModels.Bits(bits, 12)); lo = Math.Min(lo, x); hi = Math.Max(hi, x); }
            Assert.Equal(hi, Input(max[j].Units), 12);
            Assert.Equal(lo, Input(min[j].Units), 12);
            Assert.Equal(hi, ranges[j].Max, 12);
        }
    }

    [Fact]
    public void Near_threshold_vectors_come_in_pairs_one_bit_apart_across_the_threshold()
    {
        var m = WithThreshold(TestModels.Random(ModelKind.Rbm, 24, 8, 5));
        var scorer = new ReferenceScorer(m);
        var near = TestVectorSet.Generate(m, new TestVectorOptions(80, 2)).Where(x => x.Origin == VectorOrigin.NearThreshold).ToList();
        Assert.True(near.Count >= 10);
        for (int k = 0; k + 1 < near.Count; k += 2)
        {
            Assert.Equal(1, near[k].Units.Zip(near[k + 1].Units).Count(p => p.First != p.Second));
            Assert.True(scorer.FreeEnergy(near[k].Units) <= m.Threshold);
            Assert.True(scorer.FreeEnergy(near[k + 1].Units) > m.Threshold);
        }
    }
}
