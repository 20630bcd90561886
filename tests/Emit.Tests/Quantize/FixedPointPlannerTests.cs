using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Quantize;

public sealed class FixedPointPlannerTests
{
    [Theory]
    [InlineData(100)]
    [InlineData(4)]
    [InlineData(131072)]
    public void Table_size_must_be_a_power_of_two_in_range(int n)
    {
        var m = TestModels.Random(ModelKind.Rbm, 5, 3, 1);
        var ex = Assert.Throws<EmitException>(() => FixedPointPlanner.Build(m, new FixedPointOptions(SoftplusTableSize: n)));
        Assert.Contains("softplus_table", ex.Problem); // the project-file key: the library does not speak in CLI flags
    }

    [Fact]
    public void General_models_above_16_hidden_units_are_refused_with_the_reason()
    {
        var m = TestModels.Random(ModelKind.General, 3, 17, 1, linkDensity: 0.1);
        var ex = Assert.Throws<EmitException>(() => FixedPointPlanner.Build(m));
        Assert.Contains("2^17", ex.Problem);
        Assert.Contains("16", ex.Hint);
    }

    [Fact]
    public void Auto_picks_int32_when_it_loses_nothing_and_int64_when_int32_would_coarsen_the_weights()
    {
        var m = TestModels.Random(ModelKind.Rbm, 50, 20, 1, scale: 0.6);
        var p16 = FixedPointPlanner.Build(m, new FixedPointOptions(WeightType.Int16));
        Assert.Equal(AccumulatorType.Int32, p16.Accumulator);
        // A wide layer: int32 needs a smaller E but stores the same weights, so auto still takes int32.
        var wide = TestModels.Random(ModelKind.Rbm, 300, 120, 2, scale: 0.6);
        var pw = FixedPointPlanner.Build(wide, new FixedPointOptions(WeightType.Int16));
        var pw64 = FixedPointPlanner.Build(wide, new FixedPointOptions(WeightType.Int16, AccumulatorType.Int64));
        Assert.Equal(AccumulatorType.Int32, pw.Accumulator);
        Assert.True(pw.EnergyFractionBits < pw64.EnergyFractionBits);
        Assert.Equal(pw64.Weights.ToArray(), pw.Weights.ToArray());
        var p32 = FixedPointPlanner.Build(m, new FixedPointOptions(WeightType.Int32));
        Assert.Equal(AccumulatorType.Int64, p32.Accumulator);
        Assert.Contains("auto", p32.AccumulatorReason);
        var forced = FixedPointPlanner.Build(m, new FixedPointOptions(WeightType.Int32, AccumulatorType.Int32));
        Assert.Equal(AccumulatorType.Int32, forced.Accumulator);
        Assert.Contains(forced.Units.Zip(p32.Units), u => u.First.FractionBits < u.Second.FractionBits);
    }

    [Fact]
    public void Formats_follow_from_the_weight_range()
    {
        // One hidden unit whose largest |W| is 1.5: int16 allows 2^14 · 1.5 = 24576 ≤ 32767 but not 2^15 · 1.5,
        // so the column is Q1.14; int8: 2^6 · 1.5 = 96 ≤ 127, so Q1.6.
        var m = new BoltzmannModel(ModelKind.Rbm, 3, 1, [0.1, 0.2, -0.3], [0.5], [1.5, -0.75, 0.25]);
        var p16 = FixedPointPlanner.Build(m);
        Assert.Equal("Q1.14", p16.Units[0].WeightFormat.ToString());
        Assert.Equal(14, p16.Units[0].FractionBits);
        Assert.Equal([24576L, -12288L, 4096L], p16.Weights.ToArray());
        Assert.Equal("Q1.14 (1 unit)", p16.WeightFormatSummary);
        Assert.Equal($"Q{31 - p16.EnergyFractionBits}.{p16.EnergyFractionBits}", p16.EnergyFormat.ToString());
        Assert.Equal(Math.ScaleB(1.0, p16.EnergyFractionBits), p16.EnergyScale);
        var p8 = FixedPointPlanner.Build(m, new FixedPointOptions(WeightType.Int8));
        Assert.Equal("Q1.6", p8.Units[0].WeightFormat.ToString());
        Assert.Equal([96L, -48L, 16L], p8.Weights.ToArray());
        Assert.Equal(3, p8.WeightBytes);
    }

    [Fact]
    public void Every_stated_range_check_holds_and_names_are_unique()
    {
        foreach (var kind in new[] { ModelKind.Rbm, ModelKind.Lateral, ModelKind.General })
        {
            var plan = FixedPointPlanner.Build(TestModels.Random(kind, 20, 6, 3));
            Assert.NotEmpty(plan.Checks);
            Assert.All(plan.Checks, c => Assert.True(c.Holds, c.Name));
            Assert.Equal(plan.Checks.Length, plan.Checks.Select(c => c.Name).Distinct().Count());
            Assert.Contains(plan.Checks, c => c.Name == "energy.sum");
            Assert.Contains(plan.Checks, c => c.Name == "hidden[5].accumulator");
        }
    }

    [Fact]
    public void Planning_is_deterministic()
    {
        var m = TestModels.Random(ModelKind.Lateral, 25, 9, 12);
        var a = FixedPointPlanner.Build(m);
        var b = FixedPointPlanner.Build(m);
        Assert.Equal(a.Weights.ToArray(), b.Weights.ToArray());
        Assert.Equal(a.Table.Entries.ToArray(), b.Table.Entries.ToArray());
        Assert.Equal(a.EnergyOffset, b.EnergyOffset);
        Assert.Equal(a.ErrorBound, b.ErrorBound);
        Assert.Equal(a.Lateral.ToArray(), b.Lateral.ToArray());
    }

    [Fact]
    public void The_bound_is_the_sum_of_its_parts()
    {
        var plan = FixedPointPlanner.Build(TestModels.Random(ModelKind.Lateral, 20, 8, 4));
        var e = plan.Error;
        var parts = e.VisibleBias + e.Lateral + e.HiddenInputs + e.Softplus + e.LogSumExp;
        var total = -parts.Shift(e.Offset);
        Assert.Equal(total.Lo, e.Total.Lo, 15);
        Assert.Equal(total.Hi, e.Total.Hi, 15);
        Assert.Equal(Math.Max(-total.Lo, total.Hi) + e.Slack, plan.ErrorBound, 15);
        // The centring offset leaves the interval symmetric to within one energy LSB.
        Assert.True(Math.Abs(total.Lo + total.Hi) <= plan.EnergyFormat.Lsb);
    }
}
