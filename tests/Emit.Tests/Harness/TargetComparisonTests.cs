using System.Collections.Immutable;
using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Tests.Harness;

/// <summary>
/// The verdict rules on hand-made results. Worked example (common practice, derived by hand): with no hidden
/// units F(v) = −b·v, so with b = (1, 0.5) F(1,0) = −1 and F(1,1) = −1.5 exactly; threshold −1.
/// </summary>
public sealed class TargetComparisonTests
{
    private static readonly BoltzmannModel Linear =
        new BoltzmannModel(ModelKind.Rbm, 2, 0, [1.0, 0.5], [], [], ImmutableArray<Link>.Empty, ImmutableArray<Link>.Empty).With(threshold: -1.0, null);

    private static ScoredRow Row(double f, int decision = 0, bool same = true) => new(BitConverter.DoubleToUInt64Bits(f), same, (sbyte)decision);

    private static TargetResult Finish(TargetComparison c, int selfTest = 0) =>
        c.Finish("c", null, true, Linear.Sha256, selfTest, [], 0, 0);

    [Fact]
    public void Exact_results_and_matching_decisions_pass()
    {
        var c = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        c.Add(0, -1.0, null, Row(-1.0, decision: 0));
        c.Add(1, -1.5, null, Row(-1.5, decision: 0));
        var r = Finish(c);
        Assert.True(r.Passed, string.Join("; ", r.Failures));
        Assert.Equal(0.0, r.MaxAbsError);
        Assert.Equal(0, r.DecisionMismatches);
        Assert.Equal(2, r.Histogram.Exact);
    }

    [Fact]
    public void A_decision_mismatch_at_the_threshold_is_explained_and_one_far_from_it_is_not()
    {
        var c = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        c.Add(0, -1.0, null, Row(-1.0, decision: 1));   // F = t: within any bound of the threshold
        var explained = Finish(c);
        Assert.Equal(1, explained.DecisionMismatches);
        Assert.Equal(0, explained.UnexplainedMismatches);
        Assert.True(explained.Passed);

        c.Add(1, -1.5, null, Row(-1.5, decision: 1));   // 0.5 nats below the threshold, yet "unusual"
        var r = Finish(c);
        Assert.Equal(2, r.DecisionMismatches);
        Assert.Equal(1, r.UnexplainedMismatches);
        Assert.False(r.Passed);
        Assert.Contains(r.Failures, f => f.Contains("farther from the threshold", StringComparison.Ordinal) && f.Contains("vector 1", StringComparison.Ordinal));
    }

    [Fact]
    public void An_error_above_the_bound_fails_and_names_the_vector_and_the_size()
    {
        var c = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        c.Add(0, -1.0, null, Row(-1.0));
        c.Add(1, -1.5, null, Row(-1.375));
        var r = Finish(c);
        Assert.False(r.Passed);
        Assert.Equal(0.125, r.MaxAbsError);
        Assert.Equal(0.0625, r.MeanAbsError);
        Assert.Equal(1, r.WorstVector);
        Assert.Contains(r.Failures, f => f.Contains("0.125 nats (vector 1) is above the bound", StringComparison.Ordinal));
    }

    [Fact]
    public void Entry_point_disagreement_self_test_failures_and_not_a_number_fail()
    {
        var c = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        c.Add(0, -1.0, null, Row(-1.0, same: false));
        var r = Finish(c, selfTest: 2);
        Assert.False(r.Passed);
        Assert.Contains(r.Failures, f => f.Contains("entry points differ on 1 inputs", StringComparison.Ordinal));
        Assert.Contains(r.Failures, f => f.Contains("self-test reports 2 failing", StringComparison.Ordinal));

        var nan = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        nan.Add(0, -1.0, null, Row(double.NaN));
        var n = Finish(nan);
        Assert.False(n.Passed);
        Assert.Equal(double.PositiveInfinity, n.MaxAbsError);
        Assert.Equal(1, n.Histogram.Above);
    }

    [Fact]
    public void F32_results_are_read_from_their_32_bits()
    {
        var e = NumericExpectation.For(Linear, NumericMode.F32, null);
        Assert.Equal(4, e.EnergyBytes);
        Assert.Equal(-1.5, e.Decode(BitConverter.SingleToUInt32Bits(-1.5f)));
        Assert.Equal(FloatErrorBound.Worst(Linear, NumericMode.F32) + FloatErrorBound.ReferenceWorst(Linear), e.ErrorBound);
    }

    /// <summary>Fixed mode: results equal to the integer simulator's pass; one LSB off fails although it is within the bound.</summary>
    [Fact]
    public void Fixed_point_results_must_equal_the_simulator_bit_for_bit()
    {
        var model = TestModels.Random(ModelKind.Rbm, 12, 5, seed: 3).With(threshold: 0.0, null);
        var e = NumericExpectation.For(model, NumericMode.Fixed, new FixedPointOptions(WeightType.Int16));
        Assert.True(e.IsFixed);
        var scorer = new ReferenceScorer(model);
        var good = new TargetComparison(e);
        var bad = new TargetComparison(e);
        var rng = new Random(5);
        for (int k = 0; k < 50; k++)
        {
            var units = TestModels.RandomUnits(model.Visible, rng);
            long raw = e.Simulator!.FreeEnergy(units);
            double reference = scorer.FreeEnergy(units);
            ulong Bits(long x) => e.EnergyBytes == 4 ? (uint)(int)x : (ulong)x;
            sbyte decision = (sbyte)(raw / e.Scale > 0 ? 1 : 0);
            good.Add(k, reference, raw, new ScoredRow(Bits(raw), true, decision));
            bad.Add(k, reference, raw, new ScoredRow(Bits(k == 17 ? raw + 1 : raw), true, decision));
        }
        var g = good.Finish("c", null, true, model.Sha256, 0, [], 0, 0);
        Assert.True(g.Passed, string.Join("; ", g.Failures));
        Assert.True(g.BitExact);
        Assert.True(g.MaxAbsError <= e.ErrorBound);
        var b = bad.Finish("c", null, true, model.Sha256, 0, [], 0, 0);
        Assert.False(b.Passed);
        Assert.False(b.BitExact);
        Assert.Equal(1, b.BitMismatches);
        Assert.True(b.MaxAbsError <= e.ErrorBound);     // within the bound, failed for not being bit-exact
        Assert.Contains(b.Failures, f => f.Contains("vector 17", StringComparison.Ordinal));
    }

    [Fact]
    public void A_failing_feature_fails_the_target_and_names_the_feature()
    {
        var c = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        c.Add(0, -1.0, null, Row(-1.0));
        FeatureResult[] features =
        [
            new("filter", 10, 0, "decisions through a 2-of-3 filter", []),
            new("explain", 4, 1, "top 2 flips", ["vector 3: unit 1 expected first"]),
        ];
        var r = c.Finish("c", null, true, Linear.Sha256, 0, [], 0, 0, features: features);
        Assert.False(r.Passed);
        Assert.Equal(2, r.Features.Count);
        Assert.Single(r.Failures);
        Assert.Contains("explain: 1 of 4", r.Failures[0], StringComparison.Ordinal);
        Assert.Contains("unit 1 expected first", r.Failures[0], StringComparison.Ordinal);

        var passing = new TargetComparison(NumericExpectation.For(Linear, NumericMode.F64, null));
        passing.Add(0, -1.0, null, Row(-1.0));
        Assert.True(passing.Finish("c", null, true, Linear.Sha256, 0, [], 0, 0, features: [features[0]]).Passed);
    }
}
