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
public sealed class FloatScorerPlan
{
    /// <summary>Most hidden units a generated general-model scorer enumerates (2^16 states per input).</summary>
    public const int MaxGeneralHidden = 16;

    private FloatScorerPlan(BoltzmannModel model, CompileOptions options, string modelLabel)
    {
        Model = model;
        Options = options;
        ModelLabel = modelLabel;
    }

    public BoltzmannModel Model { get; }
    public CompileOptions Options { get; }
    public NumericMode Mode => Options.Numeric;

    /// <summary>The model's file name (not path), as given; sanitise before printing.</summary>
    public string ModelLabel { get; }

    public int Visible => Model.Visible;
    public int Hidden => Model.Hidden;
    public int PackedBytes => (Model.Visible + 7) / 8;

    /// <summary>Mask of the used bits of the last packed byte; 0xFF when all eight are units.</summary>
    public int LastByteMask => Model.Visible % 8 == 0 ? 0xFF : (1 << (Model.Visible % 8)) - 1;

    public ImmutableArray<double> VisibleBias { get; private set; }
    public ImmutableArray<double> HiddenBias { get; private set; }

    /// <summary>W row-major, one row of <see cref="Hidden"/> values per visible unit.</summary>
    public ImmutableArray<double> Weights { get; private set; }

    /// <summary>
    /// Lateral links grouped by their higher unit: the links of unit i to units j &lt; i are entries
    /// LinkStart[i] .. LinkStart[i+1]−1 of <see cref="LinkOther"/> and <see cref="LinkWeight"/>.
    /// </summary>
    public ImmutableArray<int> LinkStart { get; private set; }
    public ImmutableArray<int> LinkOther { get; private set; }
    public ImmutableArray<double> LinkWeight { get; private set; }
    public int LinkCount => LinkOther.Length;

    /// <summary>general: M as a full symmetric H×H matrix with zero diagonal.</summary>
    public ImmutableArray<double> HiddenPairs { get; private set; }

    public double? Threshold { get; private set; }

    /// <summary>|F_generated(v) − F_exact(v)| &lt;= this for every input (nats); see <see cref="FloatErrorBound"/>.</summary>
    public double ErrorBound { get; private set; }

    public IReadOnlyList<SelfTestCase> SelfTest { get; private set; } = [];

    /// <summary>general: log2 of the Gray-code block size (scores are recomputed at every block start).</summary>
    public int GrayBlockBits => FloatErrorBound.GrayBlockBits(Model.Hidden);

    /// <summary>Unit names as one-line comment text (empty list when the model has no names).</summary>
    public IReadOnlyList<string> UnitComments { get; private set; } = [];

    /// <summary>Identifiers for unit indices: C macro suffixes and C# constant names (empty when no names).</summary>
    public IReadOnlyList<string> UnitMacroNames { get; private set; } = [];
    public IReadOnlyList<string> UnitConstantNames { get; private set; } = [];

    /// <summary>Names the generated C# class uses itself, so unit constants avoid them.</summary>
    public static readonly string[] CSharpReservedNames = ["Units"];

    public static string ToolVersion
    {
        get
        {
            var v = typeof(FloatScorerPlan).Assembly.GetName().Version ?? new Version(0, 0, 0);
            return $"{v.Major}.{v.Minor}.{Math.Max(0, v.Build)}";
        }
    }

    /// <summary>Plans a scorer; throws <see cref="EmitException"/> when the model cannot be compiled in this mode.</summary>
    public static FloatScorerPlan Build(BoltzmannModel model, CompileOptions options, string modelLabel)
    {
        var mode = options.Numeric;
        if (!mode.IsFloat()) throw new ArgumentException("float modes only", nameof(options));
        if (model.Kind == ModelKind.General && model.Hidden > MaxGeneralHidden)
            throw new EmitException(
                $"a general model's free energy sums over all 2^{model.Hidden} hidden states for every input, too slow for generated code",
                $"generated code allows hidden <= {MaxGeneralHidden} for kind general (2^{MaxGeneralHidden} states); retrain with fewer hidden units or without hidden links");
        if (options.SelfTestVectors < 1 || options.SelfTestVectors > CompileOptions.MaxSelfTestVectors)
            throw new EmitException($"--selftest-vectors {options.SelfTestVectors} is out of range", $"use 1 to {CompileOptions.MaxSelfTestVectors}");

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

        var byHigher = model.VisibleLinks.OrderBy(l => l.J).ThenBy(l => l.I).ToArray();
        var start = new int[model.Visible + 1];
        foreach (var l in byHigher) start[l.J + 1]++;
        for (int i = 0; i < model.Visible; i++) start[i + 1] += start[i];
        plan.LinkStart = [.. start];
        plan.LinkOther = [.. byHigher.Select(l => l.I)];
        plan.LinkWeight = [.. byHigher.Select((l, k) => Literals.Round(l.W, mode, $"visible_links weight {l.I},{l.J}"))];

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
        plan.SelfTest = BuildSelfTest(model, mode, options.SelfTestVectors);

        if (!model.Names.IsEmpty)
        {
            plan.UnitComments = model.Names.Select(Naming.CommentText).ToArray();
            var (c, cs) = Naming.UnitIdentifiers(model.Names, CSharpReservedNames);
            plan.UnitMacroNames = c;
            plan.UnitConstantNames = cs;
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
            double tol = FloatErrorBound.ForVector(model, mode, units) + FloatErrorBound.Reference(model, units) + Math.Abs(stored - expected);
            tol = Literals.UpwardValue(tol * (1 + 4 * u), mode);
            var label = k < labels.Length ? labels[k] : "pseudo-random sample " + (k - labels.Length + 1).ToString(CultureInfo.InvariantCulture);
            cases.Add(new SelfTestCase(units, SelfTestVectors.Pack(units), stored, tol, label));
        }
        return cases;
    }

    /// <summary>The lines of the banner every generated file starts with (no timestamp: regeneration is byte-stable).</summary>
    public IReadOnlyList<string> BannerLines(string fileName, string target) =>
    [
        $"{fileName}: generated by emit {ToolVersion} -- do not edit; regenerate with emit compile.",
        $"model: {Naming.CommentText(ModelLabel)} (kind {Model.Kind.ToText()}, {Model.Visible} visible, {Model.Hidden} hidden)",
        $"model sha256: {Model.Sha256}",
        $"options: {Options.BannerText(target)}",
        "A monitoring aid, not a safety function.",
    ];
}
