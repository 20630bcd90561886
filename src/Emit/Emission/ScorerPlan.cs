using System.Collections.Immutable;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// What every generated scorer has, whatever its arithmetic: the model and options, sizes, the lateral-link layout,
/// unit names for comments and identifiers, self-test cases, the stated error bound and the banner. A numeric mode
/// adds its own coefficients in a subclass (<see cref="FloatScorerPlan"/>; the fixed-point mode adds another), and
/// target emitters lay out whichever plan they are given.
/// </summary>
public abstract class ScorerPlan
{
    private protected ScorerPlan(BoltzmannModel model, CompileOptions options, string modelLabel)
    {
        Model = model;
        Options = options;
        ModelLabel = modelLabel;
        var byHigher = model.VisibleLinks.OrderBy(l => l.J).ThenBy(l => l.I).ToArray();
        var start = new int[model.Visible + 1];
        foreach (var l in byHigher) start[l.J + 1]++;
        for (int i = 0; i < model.Visible; i++) start[i + 1] += start[i];
        LinkStart = [.. start];
        LinkOther = [.. byHigher.Select(l => l.I)];
        LinksByHigher = [.. byHigher];
        if (!model.Names.IsEmpty)
        {
            UnitComments = model.Names.Select(Naming.CommentText).ToArray();
            var (c, cs) = Naming.UnitIdentifiers(model.Names, CSharpReservedNames);
            UnitMacroNames = c;
            UnitConstantNames = cs;
        }
    }

    /// <summary>Refuses a general model with more than <see cref="FloatScorerPlan.MaxGeneralHidden"/> hidden units, with the reason.</summary>
    private protected static void CheckGeneralHidden(BoltzmannModel model)
    {
        if (model.Kind == ModelKind.General && model.Hidden > FloatScorerPlan.MaxGeneralHidden)
            throw new EmitException(
                $"a general model's free energy sums over all 2^{model.Hidden} hidden states for every input, too slow for generated code",
                $"generated code allows hidden <= {FloatScorerPlan.MaxGeneralHidden} for kind general (2^{FloatScorerPlan.MaxGeneralHidden} states); retrain with fewer hidden units or without hidden links");
    }

    /// <summary>
    /// Most hidden units of a generated scorer. The scorer keeps its HIDDEN accumulators on the stack (C: an automatic
    /// array; C#: <c>stackalloc</c>): 16384 × 8 bytes = 128 KiB at most, within the smallest common default thread
    /// stack of a host (1 MiB for a Windows main thread; 8 MiB on Linux, from memory). 2^20 accumulators (8 MiB)
    /// overflow the stack: the C scorer crashed with SIGSEGV and the C# one aborted.
    /// </summary>
    public const int MaxHidden = 16384;

    /// <summary>Refuses a model with more than <see cref="MaxHidden"/> hidden units for generated code.</summary>
    private protected static void CheckHiddenStack(BoltzmannModel model)
    {
        if (model.Hidden > MaxHidden)
            throw new EmitException(
                $"the generated scorer keeps one accumulator per hidden unit on the stack; {model.Hidden} hidden units need " +
                $"{(long)model.Hidden * 8} bytes of stack in the worst case",
                $"generated code allows hidden <= {MaxHidden} (128 KiB of accumulators); see docs/generated-code.md");
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

    /// <summary>
    /// Lateral links grouped by their higher unit: the links of unit i to units j &lt; i are entries
    /// LinkStart[i] .. LinkStart[i+1]−1 of <see cref="LinkOther"/> (and of the mode's link weights).
    /// </summary>
    public ImmutableArray<int> LinkStart { get; }
    public ImmutableArray<int> LinkOther { get; }
    public int LinkCount => LinkOther.Length;

    /// <summary>The model's visible links in the order of <see cref="LinkOther"/>.</summary>
    protected ImmutableArray<Link> LinksByHigher { get; }

    /// <summary>|F_generated(v) − F_exact(v)| &lt;= this for every input (nats).</summary>
    public double ErrorBound { get; private protected set; }

    public IReadOnlyList<SelfTestCase> SelfTest { get; private protected set; } = [];

    /// <summary>general: log2 of the Gray-code block size (scores are recomputed at every block start).</summary>
    public int GrayBlockBits => FloatErrorBound.GrayBlockBits(Model.Hidden);

    /// <summary>Unit names as one-line comment text (empty list when the model has no names).</summary>
    public IReadOnlyList<string> UnitComments { get; } = [];

    /// <summary>Identifiers for unit indices: C macro suffixes and C# constant names (empty when no names).</summary>
    public IReadOnlyList<string> UnitMacroNames { get; } = [];
    public IReadOnlyList<string> UnitConstantNames { get; } = [];

    /// <summary>Names the generated C# class uses itself, so unit constants avoid them.</summary>
    public static readonly string[] CSharpReservedNames = ["Units"];

    public static string ToolVersion
    {
        get
        {
            var v = typeof(ScorerPlan).Assembly.GetName().Version ?? new Version(0, 0, 0);
            return $"{v.Major}.{v.Minor}.{Math.Max(0, v.Build)}";
        }
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
