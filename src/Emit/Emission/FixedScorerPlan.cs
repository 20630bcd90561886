using System.Collections.Immutable;
using System.Globalization;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// Everything an integer-only scorer contains, decided in C# before any text is laid out: the fixed-point plan
/// (<see cref="FixedPointPlanner"/>: formats, quantized tables, range checks, error bound), the lateral links in the
/// order of the scoring walk, the threshold in energy units, self-test cases whose expected values are the exact
/// integers of <see cref="FixedPointSimulator"/>, and the texts of the "scaling and overflow" comments. The
/// arithmetic the emitters lay out is the one specified in docs/fixed-point.md §4.
/// </summary>
public sealed class FixedScorerPlan : ScorerPlan
{
    private FixedScorerPlan(BoltzmannModel model, CompileOptions options, string modelLabel, FixedPointPlan plan)
        : base(model, options, modelLabel)
    {
        Fixed = plan;
    }

    /// <summary>The quantization plan the scorer executes.</summary>
    public FixedPointPlan Fixed { get; }

    /// <summary>Width of the integer accumulator.</summary>
    public AccumulatorType Accumulator => Fixed.Accumulator;
    /// <summary>Width of the stored weights.</summary>
    public WeightType WeightType => Fixed.WeightType;
    /// <summary>Bits of the accumulator (32 or 64).</summary>
    public int AccumulatorBits => Fixed.Accumulator.Bits();
    /// <summary>Bits of a stored weight (8, 16 or 32).</summary>
    public int WeightBits => Fixed.WeightType.Bits();

    /// <summary>E: fraction bits of the energy; real free energy = value / 2^E.</summary>
    public int EnergyFractionBits => Fixed.EnergyFractionBits;

    /// <summary>e: the softplus table's segment width is 2^−e (may be negative).</summary>
    public int TableStepBits => Fixed.Table.StepFractionBits;

    /// <summary>N: segments of the softplus table (N + 1 entries).</summary>
    public int TableSegments => Fixed.Table.Segments;

    /// <summary>True when the table entries are stored as uint16 (else int32).</summary>
    public bool TableEntriesUnsigned16 => !Fixed.Table.EntryFormat.Signed;

    /// <summary>f_j per hidden unit.</summary>
    public ImmutableArray<int> UnitFractionBits { get; private set; }

    /// <summary>The common f_j when every hidden unit has the same (the scorer then needs no per-unit table).</summary>
    public int? UniformFractionBits { get; private set; }

    /// <summary>
    /// Quantized lateral weights in the order of <see cref="ScorerPlan.LinkOther"/> (format
    /// <see cref="FixedPointPlan.LateralFormat"/>).
    /// </summary>
    public ImmutableArray<long> LinkWeight { get; private set; }

    /// <summary>general: M in format E as a full symmetric H×H matrix with zero diagonal; empty otherwise.</summary>
    public ImmutableArray<long> HiddenPairs { get; private set; }

    /// <inheritdoc/>
    public override int RowsPerAddition =>
        Options.Optimize == OptimizeFor.Speed && WeightBits < AccumulatorBits ? 4 : 1;

    /// <summary>
    /// The threshold in energy units: floor(t · 2^E), so for every integer f, f &gt; this exactly when f / 2^E &gt; t;
    /// clamped to one below the smallest and to the largest reachable result (which keeps that equivalence).
    /// </summary>
    public long? ThresholdUnits { get; private set; }

    /// <summary>True when <see cref="ThresholdUnits"/> was clamped to the reachable range of results.</summary>
    public bool ThresholdClamped { get; private set; }

    /// <summary>The accumulator's symmetric limit 2^(bits − 1) − 1.</summary>
    public long AccumulatorMax => Accumulator.MaxMagnitude();

    /// <summary>The weight type's symmetric limit.</summary>
    public long WeightMax => WeightType.MaxMagnitude();

    /// <summary>Smallest value the scorer returns (proved).</summary>
    public long ResultMin => (long)ResultRange.Min;

    /// <summary>Largest value the scorer returns (proved).</summary>
    public long ResultMax => (long)ResultRange.Max;

    /// <summary>Proven range of every value the scorer returns (check "energy.result").</summary>
    public IntRange ResultRange => Check("energy.result").Range;

    /// <summary>The range check of an intermediate by name (see docs/fixed-point.md §5).</summary>
    public RangeCheck Check(string name) => Fixed.Checks.First(c => c.Name == name);

    /// <summary>
    /// The hull of a per-hidden-unit check over all units ("accumulator" → every "hidden[j].accumulator").
    /// </summary>
    public IntRange? UnitCheckHull(string name)
    {
        IntRange? hull = null;
        foreach (var c in Fixed.Checks)
        {
            if (!c.Name.StartsWith("hidden[", StringComparison.Ordinal)
                || !c.Name.EndsWith("]." + name, StringComparison.Ordinal)) continue;
            hull = hull is { } h ? h.Hull(c.Range) : c.Range;
        }
        return hull;
    }

    /// <summary>A named check's range, or null when the plan has none.</summary>
    public IntRange? TryCheck(string name) =>
        Fixed.Checks.FirstOrDefault(c => c.Name == name) is { Name: not null } c ? c.Range : null;

    /// <summary>
    /// Plans a scorer (or lays out a given fixed-point plan); throws <see cref="EmitException"/> when the model cannot
    /// be compiled.
    /// </summary>
    public static FixedScorerPlan Build(BoltzmannModel model, CompileOptions options, string modelLabel,
        FixedPointPlan? plan = null)
    {
        if (options.Numeric != NumericMode.Fixed) throw new ArgumentException("fixed mode only", nameof(options));
        if (options.SelfTestVectors < 1 || options.SelfTestVectors > CompileOptions.MaxSelfTestVectors)
            throw new EmitException($"{Setting.SelfTestVectors.Ref()} {options.SelfTestVectors} is out of range",
                $"use 1 to {CompileOptions.MaxSelfTestVectors}");
        CheckGeneralHidden(model);
        CheckHiddenStack(model);
        plan ??= FixedPointPlanner.Build(model, options.FixedOptions);
        if (!ReferenceEquals(plan.Model, model) && plan.Model.Sha256 != model.Sha256)
            throw new ArgumentException("the plan belongs to another model", nameof(plan));

        var s = new FixedScorerPlan(model, options, modelLabel, plan);
        int h = model.Hidden;
        var f = plan.Units.Select(u => u.FractionBits).ToImmutableArray();
        for (int j = 0; j < h; j++)
        {
            var u = plan.Units[j];
            // The generated code derives both shifts from f_j; make sure that is what the plan means.
            if (u.TableShift != f[j] - plan.Table.StepFractionBits || u.EnergyShift != f[j] - plan.EnergyFractionBits
                || u.TableShift < 0)
                throw new InvalidOperationException($"hidden unit {j}: shifts do not follow from its fraction bits");
            if (f[j] < sbyte.MinValue || f[j] > sbyte.MaxValue)
                throw new EmitException(
                    $"hidden unit {j} needs {f[j]} fraction bits, outside what the generated table stores",
                    "rescale the model's weights");
        }
        s.UnitFractionBits = f;
        s.UniformFractionBits = h > 0 && f.All(x => x == f[0]) ? f[0] : null;

        var byPair = plan.Lateral.ToDictionary(l => (l.I, l.J), l => l.W);
        s.LinkWeight = [.. s.LinksByHigher.Select(l => byPair[(l.I, l.J)])];

        if (model.Kind == ModelKind.General)
        {
            var pairs = new long[h * h];
            foreach (var l in plan.HiddenLinks)
            {
                pairs[l.I * h + l.J] = l.W;
                pairs[l.J * h + l.I] = l.W;
            }
            s.HiddenPairs = [.. pairs];
        }
        else s.HiddenPairs = [];

        if (model.Threshold is { } t)
        {
            // t · 2^E is exact in binary floating point (a power-of-two scaling), so floor() is the exact floor.
            double scaled = Math.Floor(Math.ScaleB(t, plan.EnergyFractionBits));
            var result = s.ResultRange;
            long lo = (long)Int128.Max(result.Min - 1, -(Int128)plan.Accumulator.MaxMagnitude() - 1);
            long hi = (long)result.Max;
            long q = scaled <= lo ? lo : scaled >= hi ? hi : (long)scaled;
            s.ThresholdUnits = q;
            s.ThresholdClamped = scaled < lo || scaled > hi;
        }

        s.ErrorBound = plan.ErrorBound;
        s.SelfTest = BuildSelfTest(model, plan, options.SelfTestVectors);
        return s;
    }

    private static IReadOnlyList<SelfTestCase> BuildSelfTest(BoltzmannModel model, FixedPointPlan plan, int count)
    {
        var sim = new FixedPointSimulator(plan);
        string[] labels = ["all units off", "all units on", "maximal pre-activations", "minimal pre-activations"];
        var vectors = SelfTestVectors.Choose(model, count);
        var cases = new List<SelfTestCase>(vectors.Count);
        for (int k = 0; k < vectors.Count; k++)
        {
            var units = vectors[k];
            var packed = SelfTestVectors.Pack(units);
            long exact = sim.FreeEnergyPacked(packed);
            var label = k < labels.Length ? labels[k] : "pseudo-random sample " +
                (k - labels.Length + 1).ToString(CultureInfo.InvariantCulture);
            cases.Add(new SelfTestCase(units, packed, exact / sim.Scale, 0, label, exact));
        }
        return cases;
    }

    /// <summary>Bits needed for the largest magnitude in a range (0 for [0, 0]).</summary>
    public static int MagnitudeBits(IntRange r)
    {
        var m = r.MaxAbs;
        int bits = 0;
        while (m > 0) { bits++; m >>= 1; }
        return bits;
    }

    /// <summary>Headroom of a range in the accumulator: (width − 1) − bits of its largest magnitude.</summary>
    public int GuardBits(IntRange r) => AccumulatorBits - 1 - MagnitudeBits(r);
}
