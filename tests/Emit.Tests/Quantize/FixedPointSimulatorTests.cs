using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Quantize;

public sealed class FixedPointSimulatorTests
{
    public static TheoryData<ModelKind, WeightType, AccumulatorType?> Configurations()
    {
        var data = new TheoryData<ModelKind, WeightType, AccumulatorType?>();
        foreach (var kind in new[] { ModelKind.Rbm, ModelKind.Lateral, ModelKind.General })
            foreach (var w in new[] { WeightType.Int8, WeightType.Int16, WeightType.Int32 })
                foreach (var acc in new AccumulatorType?[] { null, AccumulatorType.Int32, AccumulatorType.Int64 })
                    data.Add(kind, w, acc);
        return data;
    }

    [Fact]
    public void Packed_and_unit_inputs_give_identical_integers()
    {
        var m = TestModels.Random(ModelKind.Lateral, 21, 7, 3);
        var sim = new FixedPointSimulator(FixedPointPlanner.Build(m));
        foreach (var u in QuantizeTestModels.RandomInputs(21, 300, 4))
        {
            var packed = new byte[3];
            for (int i = 0; i < 21; i++) packed[i >> 3] |= (byte)(u[i] << (i & 7));
            long expected = sim.FreeEnergy(u);
            Assert.Equal(expected, sim.FreeEnergyPacked(packed));
            packed[2] |= 0xE0;  // bits 21..23 lie past the last unit and are ignored
            Assert.Equal(expected, sim.FreeEnergyPacked(packed));
            var wide = u.Select(b => b == 0 ? (byte)0 : (byte)0xFF).ToArray();  // any nonzero byte is "on"
            Assert.Equal(expected, sim.FreeEnergy(wide));
        }
    }

    [Fact]
    public void Simulator_lookup_agrees_with_the_table_reference_lookup()
    {
        var m = TestModels.Random(ModelKind.Rbm, 30, 6, 9, scale: 1.0);
        var plan = FixedPointPlanner.Build(m, new FixedPointOptions(SoftplusTableSize: 64));
        var sim = new FixedPointSimulator(plan);
        for (int j = 0; j < 6; j++)
        {
            var r = plan.Units[j].Accumulator;
            long step = Math.Max(1, (long)((r.Max - r.Min) / 20000));
            for (long a = (long)r.Min; a <= (long)r.Max; a += step)
                Assert.Equal(plan.Table.LookupSoftplus(a, plan.Units[j].FractionBits), sim.SoftplusQ(a, j));
        }
    }

    /// <summary>
    /// Every input of small models: the error is within the bound, no operation overflows (the simulator checks
    /// each one), and every intermediate stays inside the range the plan claims for it.
    /// </summary>
    [Theory]
    [MemberData(nameof(Configurations))]
    public void Exhaustive_inputs_stay_within_bound_and_claimed_ranges(ModelKind kind, WeightType weights, AccumulatorType? acc)
    {
        for (int seed = 0; seed < 3; seed++)
        {
            int v = kind == ModelKind.General ? 9 : 11, h = kind == ModelKind.General ? 5 : 6;
            var m = TestModels.Random(kind, v, h, 40 + seed, scale: 1.2, linkDensity: 0.5);
            var plan = FixedPointPlanner.Build(m, new FixedPointOptions(weights, acc));
            AssertExhaustive(plan);
        }
    }

    /// <summary>
    /// Extreme parameters (hundreds to thousands of nats, all signs, and all-positive weights that push every
    /// sum to one end) under checked arithmetic: no overflow anywhere, for every input, for every configuration.
    /// </summary>
    [Theory]
    [MemberData(nameof(Configurations))]
    public void Extreme_weights_never_overflow(ModelKind kind, WeightType weights, AccumulatorType? acc)
    {
        int v = kind == ModelKind.General ? 9 : 11, h = kind == ModelKind.General ? 6 : 8;
        foreach (var (mag, positive) in new[] { (250.0, false), (4000.0, true), (1e-3, false) })
        {
            var m = QuantizeTestModels.Extreme(kind, v, h, mag, seed: (int)mag, allPositive: positive);
            var plan = FixedPointPlanner.Build(m, new FixedPointOptions(weights, acc));
            AssertExhaustive(plan);
        }
    }

    [Theory]
    [InlineData(ModelKind.Rbm, 6, 0)]
    [InlineData(ModelKind.General, 5, 0)]
    [InlineData(ModelKind.Rbm, 1, 1)]
    [InlineData(ModelKind.Lateral, 2, 1)]
    [InlineData(ModelKind.General, 1, 1)]
    [InlineData(ModelKind.General, 3, 16)]
    public void Edge_shapes_work(ModelKind kind, int v, int h)
    {
        var m = TestModels.Random(kind, v, h, 5, scale: 1.0, linkDensity: 0.2);
        AssertExhaustive(FixedPointPlanner.Build(m));
    }

    private static void AssertExhaustive(FixedPointPlan plan)
    {
        var claimed = plan.Checks.ToDictionary(c => c.Name);
        Assert.All(plan.Checks, c => Assert.True(c.Holds, c.Name));
        var seen = new Dictionary<string, (long Min, long Max)>();
        var sim = new FixedPointSimulator(plan)
        {
            Observe = (name, unit, value) =>
            {
                string key = unit >= 0 ? $"hidden[{unit}].{name}" : name;
                seen[key] = seen.TryGetValue(key, out var r) ? (Math.Min(r.Min, value), Math.Max(r.Max, value)) : (value, value);
            },
        };
        var reference = new Emit.Reference.ReferenceScorer(plan.Model);
        double worst = 0;
        foreach (var u in QuantizeTestModels.AllInputs(plan.Model.Visible))
            worst = Math.Max(worst, Math.Abs(sim.FreeEnergy(u) / sim.Scale - reference.FreeEnergy(u)));
        Assert.True(worst <= plan.ErrorBound, $"measured {worst} > bound {plan.ErrorBound}");
        foreach (var (name, (min, max)) in seen)
        {
            Assert.True(claimed.TryGetValue(name, out var check), $"intermediate {name} has no range check");
            Assert.True(min >= check.Range.Min && max <= check.Range.Max, $"{name}: seen [{min}, {max}], claimed {check.Range}");
        }
    }
}
