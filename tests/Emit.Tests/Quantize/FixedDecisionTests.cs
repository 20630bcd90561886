using System.Globalization;
using System.Runtime.CompilerServices;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;
using Xunit.Abstractions;

namespace Emit.Tests.Quantize;

/// <summary>
/// Figures (docs/benchmarks.md, "Fixed-point accuracy"): measured error against the stated bound on
/// the demo model and on random 50×20 models with weights ~ N(0, 0.6), and decisions. The fixed-point scores come
/// from <see cref="FixedPointSimulator"/>, which the generated C and C# match bit for bit (GeneratedFixedCTests,
/// GeneratedFixedCSharpTests); the exact scores from the double reference scorer (checked against brute-force
/// enumeration, numpy and scikit-learn elsewhere).
/// </summary>
public sealed class FixedDecisionTests(ITestOutputHelper output)
{
    private static string DemoPath(string file, [CallerFilePath] string here = "") =>
        Path.GetFullPath(Path.Combine(Path.GetDirectoryName(here)!, "..", "..", "..", "demo-data", file));

    private static List<byte[]> Csv(string file)
    {
        var rows = new List<byte[]>();
        foreach (var line in File.ReadLines(DemoPath(file)).Skip(1))
            if (line.Length > 0) rows.Add(line.Split(',').Select(x => x.Trim() == "1" ? (byte)1 : (byte)0).ToArray());
        return rows;
    }

    /// <summary>
    /// Inputs near the threshold: from each usual input towards an unusual one, flipping the differing bits one at a
    /// time in a fixed pseudo-random order, every intermediate input (the walk crosses the threshold somewhere).
    /// </summary>
    private static IEnumerable<byte[]> Walks(IReadOnlyList<byte[]> from, IReadOnlyList<byte[]> to, int count, int seed)
    {
        var rng = new Random(seed);
        for (int n = 0; n < count; n++)
        {
            var u = (byte[])from[rng.Next(from.Count)].Clone();
            var target = to[rng.Next(to.Count)];
            var diff = Enumerable.Range(0, u.Length).Where(i => u[i] != target[i]).OrderBy(_ => rng.Next()).ToArray();
            foreach (int i in diff)
            {
                u[i] = target[i];
                yield return (byte[])u.Clone();
            }
        }
    }

    private sealed record Tally(int Inputs, int Mismatches, int NearThreshold, double WorstMismatchDistance);

    /// <summary>
    /// Counts the inputs whose fixed-point decision (the generated code's integer comparison f &gt; THRESHOLD) differs
    /// from the exact decision F &gt; t, and asserts each lies within the stated bound of the threshold.
    /// </summary>
    private static Tally Decide(FixedPointPlan plan, IEnumerable<byte[]> inputs)
    {
        double threshold = plan.Model.Threshold!.Value;
        var scorer = FixedScorerPlan.Build(plan.Model, new CompileOptions(["c"], NumericMode.Fixed, "d", Fixed: plan.Options), "d.json", plan);
        long t = scorer.ThresholdUnits!.Value;
        var sim = new FixedPointSimulator(plan);
        var reference = new ReferenceScorer(plan.Model);
        int n = 0, mismatches = 0, near = 0;
        double worst = 0;
        foreach (var u in inputs)
        {
            n++;
            double exact = reference.FreeEnergy(u);
            bool fixedUnusual = sim.FreeEnergy(u) > t;
            bool exactUnusual = exact > threshold;
            double distance = Math.Abs(exact - threshold);
            if (distance <= plan.ErrorBound) near++;
            if (fixedUnusual == exactUnusual) continue;
            mismatches++;
            worst = Math.Max(worst, distance);
            Assert.True(distance <= plan.ErrorBound,
                $"decision differs at {distance:R} nats from the threshold, outside the bound {plan.ErrorBound:R}");
        }
        return new Tally(n, mismatches, near, worst);
    }

    public static TheoryData<WeightType> Weights() => new() { WeightType.Int16, WeightType.Int8 };

    [Theory]
    [MemberData(nameof(Weights))]
    public void Demo_model_decisions_differ_from_the_exact_scorer_only_within_the_bound_of_the_threshold(WeightType weights)
    {
        var model = ModelLoader.Load(DemoPath("reefer-fleet.json"));
        var plan = FixedPointPlanner.Build(model, new FixedPointOptions(weights));
        double t = model.Threshold!.Value;
        var normal = Csv("normal.csv");
        var faulty = Csv("faulty.csv");
        var reference = new ReferenceScorer(model);
        var usual = normal.Where(u => reference.FreeEnergy(u) <= t).ToList();
        var unusual = faulty.Concat(normal).Where(u => reference.FreeEnergy(u) > t).ToList();
        var inputs = normal.Concat(faulty).Concat(Walks(usual, unusual, 400, 7)).ToList();
        var tally = Decide(plan, inputs);
        output.WriteLine(FormattableString.Invariant(
            $"demo {weights.ToText()}: {tally.Inputs} inputs ({normal.Count} normal, {faulty.Count} faulty, the rest on walks across the threshold), {tally.NearThreshold} within the bound {plan.ErrorBound:G3} of the threshold, {tally.Mismatches} decisions differ, farthest {tally.WorstMismatchDistance:G3} nats from the threshold"));
        Assert.True(tally.NearThreshold > 0, "no input came near the threshold: the check would be empty");
    }

    [Theory]
    [MemberData(nameof(Weights))]
    public void Random_model_decisions_differ_from_the_exact_scorer_only_within_the_bound_of_the_threshold(WeightType weights)
    {
        // 50×20, weights and biases ~ N(0, 0.6); the threshold is set at the median free energy of random inputs, the
        // densest place for inputs to lie close to it
        var model = TestModels.Random(ModelKind.Rbm, 50, 20, seed: 1, scale: 0.6);
        var reference = new ReferenceScorer(model);
        var inputs = QuantizeTestModels.RandomInputs(50, 20000, 11).ToList();
        var energies = inputs.Select(u => reference.FreeEnergy(u)).Order().ToArray();
        double t = energies[energies.Length / 2];
        var plan = FixedPointPlanner.Build(model.With(t, null), new FixedPointOptions(weights));
        var usual = inputs.Where(u => reference.FreeEnergy(u) <= t).Take(500).ToList();
        var unusual = inputs.Where(u => reference.FreeEnergy(u) > t).Take(500).ToList();
        var tally = Decide(plan, inputs.Concat(Walks(usual, unusual, 400, 3)));
        output.WriteLine(FormattableString.Invariant(
            $"random 50x20 {weights.ToText()}: {tally.Inputs} inputs, {tally.NearThreshold} within the bound {plan.ErrorBound:G3} of the threshold, {tally.Mismatches} decisions differ, farthest {tally.WorstMismatchDistance:G3} nats from the threshold"));
        Assert.True(tally.NearThreshold > 0, "no input came near the threshold: the check would be empty");
    }

    /// <summary>Stated bound and largest measured error (random inputs, the demo data, and the adversarial search) per model and weight type.</summary>
    [Theory]
    [MemberData(nameof(Weights))]
    public void Accuracy_figures_measured_error_stays_within_the_stated_bound(WeightType weights)
    {
        var rows = new List<(string Model, FixedPointPlan Plan, IEnumerable<byte[]> Inputs)>();
        var demo = ModelLoader.Load(DemoPath("reefer-fleet.json"));
        rows.Add(("demo 56x16", FixedPointPlanner.Build(demo, new FixedPointOptions(weights)),
            Csv("normal.csv").Concat(Csv("faulty.csv")).Concat(QuantizeTestModels.RandomInputs(56, 2000, 5))));
        foreach (int seed in new[] { 1, 2, 3 })
        {
            var m = TestModels.Random(ModelKind.Rbm, 50, 20, seed, scale: 0.6);
            rows.Add(($"random 50x20 seed {seed}", FixedPointPlanner.Build(m, new FixedPointOptions(weights)), QuantizeTestModels.RandomInputs(50, 2000, seed)));
        }
        foreach (var (name, plan, inputs) in rows)
        {
            double random = QuantizeTestModels.MaxError(plan, inputs);
            var adv = AdversarialSearch.Run(plan);
            double measured = Math.Max(random, adv.LargestError);
            output.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"{name} | {weights.ToText()} | {plan.Accumulator.ToText()}, E = {plan.EnergyFractionBits}, weights {plan.WeightFormatSummary} | bound {plan.ErrorBound:G4} | measured {measured:G4} (random and data {random:G4}, search {adv.LargestError:G4}) | ratio {plan.ErrorBound / measured:F1}"));
            Assert.True(measured <= plan.ErrorBound, $"{name}: measured {measured} above the bound {plan.ErrorBound}");
            if (weights == WeightType.Int16 && name.StartsWith("random", StringComparison.Ordinal))
            {
                // goals for int16 on 50×20, N(0, 0.6)
                Assert.True(plan.ErrorBound <= 0.05, $"{name}: bound {plan.ErrorBound}");
                Assert.True(measured <= 0.01, $"{name}: measured {measured}");
            }
        }
    }
}
