using System.Collections.Immutable;
using System.Globalization;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Emission;

/// <summary>
/// Everything a floating-point scorer contains, decided and rounded in C# before any text is laid out: the
/// coefficients as the mode stores them, the lateral links grouped for the scoring walk, the self-test cases and the
/// error bound. Target emitters turn it into text; tests inspect it directly.
/// </summary>
public sealed class FloatScorerPlan : ScorerPlan
{
    /// <summary>Most hidden units a generated general-model scorer enumerates (2^16 states per input).</summary>
    public const int MaxGeneralHidden = 16;

    private FloatScorerPlan(BoltzmannModel model, CompileOptions options, string modelLabel) : base(model, options,
        modelLabel)
    {
    }

    /// <inheritdoc/>
    public override int RowsPerAddition => 4;

    /// <summary>Visible biases b, rounded to the mode.</summary>
    public ImmutableArray<double> VisibleBias { get; private set; }
    /// <summary>Hidden biases c, rounded to the mode.</summary>
    public ImmutableArray<double> HiddenBias { get; private set; }

    /// <summary>
    /// W row-major, one row of <see cref="ScorerPlan.Hidden"/> values per visible unit, rounded to the mode.
    /// </summary>
    public ImmutableArray<double> Weights { get; private set; }

    /// <summary>L in the order of <see cref="ScorerPlan.LinkOther"/>, rounded to the mode.</summary>
    public ImmutableArray<double> LinkWeight { get; private set; }

    /// <summary>general: M as a full symmetric H×H matrix with zero diagonal.</summary>
    public ImmutableArray<double> HiddenPairs { get; private set; }

    /// <summary>The decision threshold on F(v), rounded to the mode, or null when the model has none.</summary>
    public double? Threshold { get; private set; }

    /// <summary>
    /// Float streamed scoring accumulates afresh every max(64, VISIBLE) flips: on average at most one extra weight row
    /// per flip (a fresh accumulation adds at most VISIBLE rows), and the bound grows with it.
    /// </summary>
    public override int StreamResyncFlips => HasStream ? Math.Max(64, Visible) : 0;

    /// <summary>
    /// Explanations in a float mode: |ΔF computed − exact ΔF| &lt;= this. ΔF = F(flipped) − F(v), with F(v) read from a
    /// freshly accumulated state and F(flipped) one flip later (each within <see cref="FloatErrorBound.StreamWorst"/>
    /// of one flip), then one subtraction, whose rounding is at most u·|ΔF| &lt;= u·(|exact ΔF| + 2·bound).
    /// </summary>
    public static double ExplainBound(BoltzmannModel model, NumericMode mode)
    {
        double one = FloatErrorBound.StreamWorst(model, mode, 1), u = FloatErrorBound.UnitRoundoff(mode);
        return 2 * one * (1 + u) + u * LargestFlipChange(model);
    }

    /// <summary>max_i |b_i| + Σ_k |L_ik| + Σ_j |W_ij|: no flip changes the exact free energy by more.</summary>
    private static double LargestFlipChange(BoltzmannModel model)
    {
        int v = model.Visible, h = model.Hidden;
        var change = new double[v];
        for (int i = 0; i < v; i++)
        {
            change[i] = Math.Abs(model.VisibleBias[i]);
            for (int j = 0; j < h; j++) change[i] += Math.Abs(model.Weight(i, j));
        }
        foreach (var l in model.VisibleLinks)
        {
            change[l.I] += Math.Abs(l.W);
            change[l.J] += Math.Abs(l.W);
        }
        return v > 0 ? change.Max() : 0;
    }

    /// <summary>
    /// Plans a scorer; throws <see cref="EmitException"/> when the model cannot be compiled in this mode.
    /// </summary>
    public static FloatScorerPlan Build(BoltzmannModel model, CompileOptions options, string modelLabel)
    {
        var mode = options.Numeric;
        if (!mode.IsFloat()) throw new ArgumentException("float modes only", nameof(options));
        CheckGeneralHidden(model);
        CheckHiddenStack(model);
        CheckFeatures(model, options);
        if (options.SelfTestVectors < 1 || options.SelfTestVectors > CompileOptions.MaxSelfTestVectors)
            throw new EmitException($"{Setting.SelfTestVectors.Ref()} {options.SelfTestVectors} is out of range",
                $"use 1 to {CompileOptions.MaxSelfTestVectors}");

        var plan = new FloatScorerPlan(model, options, modelLabel);
        ImmutableArray<double> Rounded(ImmutableArray<double> values, string what)
        {
            var b = ImmutableArray.CreateBuilder<double>(values.Length);
            for (int k = 0; k < values.Length; k++) b.Add(Literals.Round(values[k], mode, $"{what}[{k}]"));
            return b.MoveToImmutable();
        }
        plan.VisibleBias = Rounded(model.VisibleBias, "visible_bias");
        plan.HiddenBias = Rounded(model.HiddenBias, "hidden_bias");
        plan.Weights = Rounded(model.Weights, "weights");

        plan.LinkWeight = [
            .. plan.LinksByHigher.Select(l => Literals.Round(l.W, mode, $"visible_links weight {l.I},{l.J}"))];

        if (model.Kind == ModelKind.General)
        {
            int h = model.Hidden;
            var pairs = new double[h * h];
            foreach (var l in model.HiddenLinks)
            {
                double w = Literals.Round(l.W, mode, $"hidden_links weight {l.I},{l.J}");
                pairs[l.I * h + l.J] = w;
                pairs[l.J * h + l.I] = w;
            }
            plan.HiddenPairs = [.. pairs];
        }
        else plan.HiddenPairs = [];

        if (model.Threshold is { } t) plan.Threshold = Literals.Round(t, mode, "threshold");
        plan.ErrorBound = FloatErrorBound.Worst(model, mode);
        FloatRangeCheck.Check(model, mode, plan.ErrorBound);
        plan.SelfTest = BuildSelfTest(model, mode, options.SelfTestVectors);
        if (plan.HasStream)
        {
            plan.StreamErrorBound = FloatErrorBound.StreamWorst(model, mode, plan.StreamResyncFlips);
            // ΔF = F(flipped) − F(v): F from a fresh state, F(flipped) one flip later, then one subtraction, whose
            // rounding is at most u·|ΔF| <= u·(|exact ΔF| + 2·bound); |exact ΔF| <= |b_i| + Σ_k |L_ik| + Σ_j |W_ij|
            // (softplus is 1-Lipschitz).
            plan.ExplainErrorBound = ExplainBound(model, mode);
        }

        return plan;
    }

    private static IReadOnlyList<SelfTestCase> BuildSelfTest(BoltzmannModel model, NumericMode mode, int count)
    {
        var scorer = new ReferenceScorer(model);
        double u = FloatErrorBound.UnitRoundoff(mode);
        string[] labels = ["all units off", "all units on", "maximal pre-activations", "minimal pre-activations"];
        var cases = new List<SelfTestCase>();
        var vectors = SelfTestVectors.Choose(model, count);
        for (int k = 0; k < vectors.Count; k++)
        {
            var units = vectors[k];
            double expected = scorer.FreeEnergy(units);
            double stored = Literals.Round(expected, mode, $"self-test vector {k}'s free energy");
            // the generated code's error, the reference's own error, the rounding of the stored expected value, and
            // the rounding of the difference computed by the check
            double tol = FloatErrorBound.ForVector(model, mode, units) + FloatErrorBound.Reference(model, units) +
                Math.Abs(stored - expected);
            tol = Literals.UpwardValue(tol * (1 + 4 * u), mode);
            var label = k < labels.Length ? labels[k] : "pseudo-random sample " +
                (k - labels.Length + 1).ToString(CultureInfo.InvariantCulture);
            cases.Add(new SelfTestCase(units, SelfTestVectors.Pack(units), stored, tol, label));
        }
        return cases;
    }

}
