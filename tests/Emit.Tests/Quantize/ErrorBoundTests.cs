using Emit.Model;
using Emit.Quantize;
using Xunit.Abstractions;

namespace Emit.Tests.Quantize;

/// <summary>
/// Property tests: on random models of every kind, weight type and accumulator, the measured error against the
/// double reference scorer (random inputs and the adversarial search's inputs) never exceeds the stated bound,
/// and the bound is not loose (bound / largest error found stays small).
/// </summary>
public sealed class ErrorBoundTests(ITestOutputHelper output)
{
    public static TheoryData<ModelKind, int, int, WeightType, AccumulatorType?> Cases()
    {
        var data = new TheoryData<ModelKind, int, int, WeightType, AccumulatorType?>();
        foreach (var w in new[] { WeightType.Int8, WeightType.Int16, WeightType.Int32 })
            foreach (var acc in new AccumulatorType?[] { null, AccumulatorType.Int32, AccumulatorType.Int64 })
            {
                data.Add(ModelKind.Rbm, 24, 10, w, acc);
                data.Add(ModelKind.Lateral, 18, 8, w, acc);
                data.Add(ModelKind.General, 14, 6, w, acc);
            }
        return data;
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void Measured_error_never_exceeds_the_bound(ModelKind kind, int v, int h, WeightType weights, AccumulatorType? acc)
    {
        for (int seed = 0; seed < 2; seed++)
        {
            var m = TestModels.Random(kind, v, h, 1000 + 17 * seed + v, scale: 0.8, linkDensity: 0.3);
            var plan = FixedPointPlanner.Build(m, new FixedPointOptions(weights, acc));
            double random = QuantizeTestModels.MaxError(plan, QuantizeTestModels.RandomInputs(v, 300, seed));
            var adversarial = AdversarialSearch.Run(plan, maxStarts: 12, maxPasses: 4);
            double found = Math.Max(random, adversarial.LargestError);
            output.WriteLine(FormattableString.Invariant(
                $"{kind} {v}x{h} {weights.ToText()} {plan.Accumulator.ToText()} seed {seed}: bound {plan.ErrorBound:G4}, random {random:G4}, adversarial {adversarial.LargestError:G4}, ratio {plan.ErrorBound / found:F2}"));
            Assert.True(random <= plan.ErrorBound, $"random inputs: {random} > bound {plan.ErrorBound}");
            Assert.True(adversarial.LargestError <= plan.ErrorBound, $"adversarial: {adversarial.LargestError} > bound {plan.ErrorBound}");
            // Looseness guard: the bound is a worst case over all 2^v inputs, a greedy search finds a good share.
            Assert.True(plan.ErrorBound <= 8 * found, $"bound {plan.ErrorBound} is more than 8× the largest error found {found}");
        }
    }

    [Fact]
    public void Adversarial_vectors_beat_random_ones()
    {
        var m = TestModels.Random(ModelKind.Rbm, 40, 16, 77, scale: 0.6);
        var plan = FixedPointPlanner.Build(m);
        double random = QuantizeTestModels.MaxError(plan, QuantizeTestModels.RandomInputs(40, 500, 1));
        var adv = AdversarialSearch.Run(plan);
        Assert.True(adv.LargestError > random, $"adversarial {adv.LargestError} vs random {random}");
        Assert.Equal(adv.LargestError, QuantizeTestModels.MaxError(plan, [adv.Vector]), 12);
        Assert.True(adv.Ratio >= 1);
    }

    [Fact]
    public void A_bigger_table_shrinks_the_table_part_of_the_bound()
    {
        var m = TestModels.Random(ModelKind.Rbm, 30, 12, 5);
        var small = FixedPointPlanner.Build(m, new FixedPointOptions(SoftplusTableSize: 32));
        var large = FixedPointPlanner.Build(m, new FixedPointOptions(SoftplusTableSize: 1024));
        Assert.True(large.Error.Softplus.Width < small.Error.Softplus.Width / 4,
            $"N=1024: {large.Error.Softplus}, N=32: {small.Error.Softplus}");
        Assert.True(large.ErrorBound < small.ErrorBound);
        Assert.Equal(32, small.Table.Segments);
        Assert.Equal(1025 * large.Table.EntryFormat.TotalBits / 8, large.TableBytes);
    }
}
