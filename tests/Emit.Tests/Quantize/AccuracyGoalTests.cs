using Emit.Model;
using Emit.Quantize;
using Xunit.Abstractions;

namespace Emit.Tests.Quantize;

/// <summary>
/// The accuracy goal for fixed point: on a 50×20 model with weights (and biases) ~ N(0, 0.6), int16 weights must
/// give a stated bound ≤ 0.05 nats and a measured maximum error ≤ 0.01 nats (random inputs plus the adversarial
/// search). int8 is reported (a coarser goal is not fixed); its measured error must still respect its bound.
/// </summary>
public sealed class AccuracyGoalTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void Int16_meets_the_goal_on_50_by_20(int seed)
    {
        var m = TestModels.Random(ModelKind.Rbm, 50, 20, seed, scale: 0.6);
        var plan = FixedPointPlanner.Build(m, new FixedPointOptions(WeightType.Int16));
        double random = QuantizeTestModels.MaxError(plan, QuantizeTestModels.RandomInputs(50, 2000, seed));
        var adv = AdversarialSearch.Run(plan);
        double measured = Math.Max(random, adv.LargestError);
        output.WriteLine(FormattableString.Invariant(
            $"int16 seed {seed}: {plan.Accumulator.ToText()}, E = {plan.EnergyFractionBits}, weights {plan.WeightFormatSummary}, bound {plan.ErrorBound:G4}, measured {measured:G4}, ratio {plan.ErrorBound / measured:F2}"));
        Assert.True(plan.ErrorBound <= 0.05, $"bound {plan.ErrorBound}");
        Assert.True(measured <= 0.01, $"measured {measured}");
        Assert.True(measured <= plan.ErrorBound);
        Assert.Equal(AccumulatorType.Int32, plan.Accumulator);
    }

    [Fact]
    public void Int8_on_50_by_20_respects_its_bound()
    {
        var m = TestModels.Random(ModelKind.Rbm, 50, 20, 1, scale: 0.6);
        var plan = FixedPointPlanner.Build(m, new FixedPointOptions(WeightType.Int8));
        double random = QuantizeTestModels.MaxError(plan, QuantizeTestModels.RandomInputs(50, 2000, 1));
        var adv = AdversarialSearch.Run(plan);
        double measured = Math.Max(random, adv.LargestError);
        output.WriteLine(FormattableString.Invariant(
            $"int8: weights {plan.WeightFormatSummary}, bound {plan.ErrorBound:G4}, measured {measured:G4} (random {random:G4}), ratio {plan.ErrorBound / measured:F2}"));
        Assert.True(measured <= plan.ErrorBound);
        Assert.True(plan.ErrorBound <= 2.0, $"int8 bound {plan.ErrorBound}");
    }
}
