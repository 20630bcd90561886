using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Emission;

/// <summary>
/// Fixed-point variants of <see cref="CodegenCases"/>: every model shape with int8/int16/int32 weights and int32/int64
/// accumulators, and the inputs to score: the float cases' inputs plus, per hidden unit, the inputs that push its
/// weight rounding error up and down and its pre-activation to both ends (the adversarial starts of
/// <see cref="AdversarialSearch"/>), and the worst input the search finds from a few of them.
/// </summary>
internal static class FixedCodegenCases
{
    public static readonly WeightType[] Weights = [WeightType.Int8, WeightType.Int16, WeightType.Int32];
    public static readonly AccumulatorType[] Accumulators = [AccumulatorType.Int32, AccumulatorType.Int64];

    public sealed record Combo(CodegenCases.Case Case, WeightType Weights, AccumulatorType Accumulator)
    {
        public string Name => Case.Id + "_" + Weights.ToText() + "_" + Accumulator.ToText();
        public FixedPointOptions Options => new(Weights, Accumulator);
    }

    /// <summary>Every case × weight type × accumulator type.</summary>
    public static IReadOnlyList<Combo> All { get; } =
        [.. from c in CodegenCases.All from w in Weights from a in Accumulators select new Combo(c, w, a)];

    public static Combo Find(string name) => All.Single(x => x.Name == name);

    public static TheoryData<string> Names()
    {
        var data = new TheoryData<string>();
        foreach (var c in All) data.Add(c.Name);
        return data;
    }

    private static readonly Dictionary<string, FixedPointPlan> Plans = new();

    public static FixedPointPlan Plan(Combo c)
    {
        lock (Plans)
        {
            if (!Plans.TryGetValue(c.Name, out var p)) Plans[c.Name] = p = FixedPointPlanner.Build(c.Case.Model, c.Options);
            return p;
        }
    }

    public static CompileOptions Options(Combo c, string target, string? name = null, int selfTest = CompileOptions.DefaultSelfTestVectors) =>
        new([target], NumericMode.Fixed, name ?? c.Name, "Emit.Tests.Generated", selfTest, null, c.Options);

    /// <summary>Generated files for a combination, written to <paramref name="dir"/>; returns the scorer name.</summary>
    public static string Generate(Combo c, string dir, string target = "c")
    {
        var files = ScorerCompiler.Build(c.Case.Model, c.Case.Id + ".json", Options(c, target)).AllFiles;
        foreach (var f in files) File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        return c.Name;
    }

    /// <summary>The float cases' inputs, then the per-unit adversarial inputs, then the search's worst input.</summary>
    public static IReadOnlyList<byte[]> Vectors(Combo c)
    {
        var plan = Plan(c);
        var model = c.Case.Model;
        int v = model.Visible, h = model.Hidden;
        var list = new List<byte[]>(CodegenCases.Vectors(c.Case));
        list.AddRange(AdversarialSearch.StartingVectors(plan).Skip(2)); // per-unit worst-rounding and extreme inputs
        // The greedy search is cheap except for general models with many hidden units (2^H states per input).
        bool big = model.Kind == ModelKind.General && h > 8;
        list.Add(AdversarialSearch.Run(plan, maxStarts: big ? 2 : 8, maxPasses: big ? 1 : 3).Vector);
        return list;
    }
}
