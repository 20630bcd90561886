using System.Collections.Immutable;
using Emit.Detection;
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
        LinkHigher = [.. byHigher.Select(l => l.J)];
        LinksByHigher = [.. byHigher];
        if (!model.Names.IsEmpty) UnitComments = model.Names.Select(Naming.CommentText).ToArray();
        if (options.AlarmFilter is { } filter && model.Threshold is null)
            throw new EmitException(
                $"the alarm filter {filter} votes on the scorer's decisions, and the model has no threshold",
                "set one first with emit calibrate (or give the model a threshold), or leave the alarm filter out");
        // every link of a unit, whichever end it is: streamed scoring and explanations update a unit's field
        var ends = new List<(int Other, int Link)>[model.Visible];
        for (int i = 0; i < model.Visible; i++) ends[i] = [];
        for (int n = 0; n < byHigher.Length; n++)
        {
            ends[byHigher[n].J].Add((byHigher[n].I, n));
            ends[byHigher[n].I].Add((byHigher[n].J, n));
        }
        var adjacent = new int[model.Visible + 1];
        for (int i = 0; i < model.Visible; i++) adjacent[i + 1] = adjacent[i] + ends[i].Count;
        var sorted = ends.Select(e => e.OrderBy(x => x.Other).ToArray()).ToArray();
        AdjacentStart = [.. adjacent];
        AdjacentOther = [.. sorted.SelectMany(e => e.Select(x => x.Other))];
        AdjacentLink = [.. sorted.SelectMany(e => e.Select(x => x.Link))];
    }

    /// <summary>The K-of-N alarm filter emitted beside the scorer (docs/generated-code.md), or null.</summary>
    public AlarmFilterSpec? AlarmFilter => Options.AlarmFilter;

    /// <summary>True when the alarm filter is emitted.</summary>
    public bool HasFilter => AlarmFilter is not null;

    /// <summary>The filter's history mask: the low N bits of a 32-bit word (0 without a filter).</summary>
    public long FilterMask => AlarmFilter is { N: var n } ? (long)(uint.MaxValue >> (32 - n)) : 0;

    /// <summary>
    /// Refuses the streamed-scoring and explanation options for a model they do not support (kind general: a flip
    /// changes the 2^hidden-state log-sum-exp as a whole, so no per-unit update is cheaper than scoring afresh).
    /// </summary>
    private protected static void CheckFeatures(BoltzmannModel model, CompileOptions options)
    {
        var setting = (options.Explain ? Setting.Explain : Setting.Stream).Ref();
        if (options.EmitsStream && model.Kind == ModelKind.General)
            throw new EmitException(
                $"{setting} supports kinds rbm and lateral, not general " +
                "(a flip changes the sum over all hidden states as a whole)",
                $"leave {setting} out, or use emit explain on the host");
        // NAME_stream_reset/_flip/_free_energy and NAME_explain differ within 10 characters after the name, inside the
        // 31 significant characters of C99 5.2.4.1 for every name Naming.CheckScorerName accepts.
    }

    /// <summary>True when the streamed-scoring code is emitted (docs/generated-code.md).</summary>
    public bool HasStream => Options.EmitsStream;

    /// <summary>True when the explanation code is emitted.</summary>
    public bool HasExplain => Options.Explain;

    /// <summary>
    /// All links of each visible unit (either end), for streamed scoring: those of unit i are entries
    /// AdjacentStart[i] .. AdjacentStart[i+1]−1 of <see cref="AdjacentOther"/> (the other unit, increasing) and
    /// <see cref="AdjacentLink"/> (the link's index in <see cref="LinkOther"/> and the link weights).
    /// </summary>
    public ImmutableArray<int> AdjacentStart { get; }

    /// <summary>The other unit of each entry of the adjacency lists (see <see cref="AdjacentStart"/>).</summary>
    public ImmutableArray<int> AdjacentOther { get; }

    /// <summary>The link index of each entry of the adjacency lists (see <see cref="AdjacentStart"/>).</summary>
    public ImmutableArray<int> AdjacentLink { get; }

    /// <summary>
    /// Streamed scoring: |stream free energy − exact free energy| &lt;= this (nats) after any sequence of flips; the
    /// scorer's bound in fixed mode (the stream is bit-identical to it).
    /// </summary>
    public double StreamErrorBound { get; private protected set; }

    /// <summary>Explanations: |ΔF computed − exact ΔF| &lt;= this (nats) for every input and unit.</summary>
    public double ExplainErrorBound { get; private protected set; }

    /// <summary>
    /// Float streamed scoring: the state is accumulated afresh from the current input every this many flips, which
    /// keeps rounding drift inside <see cref="StreamErrorBound"/>; 0 in fixed mode (integer updates are exact).
    /// </summary>
    public virtual int StreamResyncFlips => 0;

    /// <summary>
    /// Refuses a general model with more than <see cref="FloatScorerPlan.MaxGeneralHidden"/> hidden units, with the
    /// reason.
    /// </summary>
    private protected static void CheckGeneralHidden(BoltzmannModel model)
    {
        if (model.Kind == ModelKind.General && model.Hidden > FloatScorerPlan.MaxGeneralHidden)
            throw new EmitException(
                $"a general model's free energy sums over all 2^{model.Hidden} hidden states for every input, too " +
                "slow for generated code",
                $"generated code allows hidden <= {FloatScorerPlan.MaxGeneralHidden} for kind general " +
                $"(2^{FloatScorerPlan.MaxGeneralHidden} states); retrain with fewer hidden units or without hidden " +
                "links");
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
                $"the generated scorer keeps one accumulator per hidden unit on the stack; {model.Hidden} hidden " +
                "units need " +
                $"{(long)model.Hidden * 8} bytes of stack in the worst case",
                $"generated code allows hidden <= {MaxHidden} (128 KiB of accumulators); see docs/generated-code.md");
    }

    /// <summary>The model the scorer is planned for.</summary>
    public BoltzmannModel Model { get; }
    /// <summary>The compile options the plan follows.</summary>
    public CompileOptions Options { get; }
    /// <summary>The numeric mode (f32, f64 or fixed).</summary>
    public NumericMode Mode => Options.Numeric;

    /// <summary>The model's file name (not path), as given; sanitise before printing.</summary>
    public string ModelLabel { get; }

    /// <summary>Visible units: the length of an input vector.</summary>
    public int Visible => Model.Visible;
    /// <summary>Hidden units.</summary>
    public int Hidden => Model.Hidden;
    /// <summary>Bytes of a packed input (eight units per byte, unit 0 in the low bit of byte 0).</summary>
    public int PackedBytes => (Model.Visible + 7) / 8;

    /// <summary>Mask of the used bits of the last packed byte; 0xFF when all eight are units.</summary>
    public int LastByteMask => Model.Visible % 8 == 0 ? 0xFF : (1 << (Model.Visible % 8)) - 1;

    /// <summary>
    /// Lateral links grouped by their higher unit: the links of unit i to units j &lt; i are entries
    /// LinkStart[i] .. LinkStart[i+1]−1 of <see cref="LinkOther"/> (and of the mode's link weights).
    /// </summary>
    public ImmutableArray<int> LinkStart { get; }
    /// <summary>The lower unit of each lateral link, grouped as <see cref="LinkStart"/> says.</summary>
    public ImmutableArray<int> LinkOther { get; }
    /// <summary>Number of lateral links.</summary>
    public int LinkCount => LinkOther.Length;

    /// <summary>The higher unit of each link, in the order of <see cref="LinkOther"/>.</summary>
    public ImmutableArray<int> LinkHigher { get; }

    /// <summary>The model's visible links in the order of <see cref="LinkOther"/>.</summary>
    protected ImmutableArray<Link> LinksByHigher { get; }

    /// <summary>|F_generated(v) − F_exact(v)| &lt;= this for every input (nats).</summary>
    public double ErrorBound { get; private protected set; }

    /// <summary>Inputs and expected results of the boot self-test compiled into the scorer.</summary>
    public IReadOnlyList<SelfTestCase> SelfTest { get; private protected set; } = [];

    /// <summary>general: log2 of the Gray-code block size (scores are recomputed at every block start).</summary>
    public int GrayBlockBits => FloatErrorBound.GrayBlockBits(Model.Hidden);

    /// <summary>general: states per Gray-code block (2^<see cref="GrayBlockBits"/>).</summary>
    public long GrayBlockStates => 1L << GrayBlockBits;

    /// <summary>general: Gray-code blocks in a walk over all hidden states.</summary>
    public long GrayBlocks => 1L << (Model.Hidden - GrayBlockBits);

    /// <summary>All 2^hidden states of a general model's hidden units.</summary>
    public long HiddenStates => 1L << Model.Hidden;

    /// <summary>Unit names as one-line comment text (empty list when the model has no names).</summary>
    public IReadOnlyList<string> UnitComments { get; } = [];

    /// <summary>
    /// The model's unit names as given (empty when it has none); a dialect makes identifiers of them.
    /// </summary>
    public IReadOnlyList<string> UnitNames => Model.Names;

    /// <summary>The comment naming visible unit i: "i: name" or "unit i".</summary>
    public string UnitLabel(int i) =>
        UnitComments.Count > 0 ? Inv(i) + ": " + UnitComments[i] : "unit " + Inv(i);

    private static string Inv(long n) => n.ToString(System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>True when the model has hidden units.</summary>
    public bool HasHidden => Model.Hidden > 0;

    /// <summary>
    /// True for kind general (links between hidden units: the hidden part is a log-sum-exp over all states).
    /// </summary>
    public bool IsGeneral => Model.Kind == ModelKind.General;

    /// <summary>True when the model has lateral links between visible units.</summary>
    public bool HasLinks => LinkCount > 0;

    /// <summary>True when the last packed byte has unused bits (they are masked off).</summary>
    public bool HasPartialByte => LastByteMask != 0xFF;

    /// <summary>True when the model carries a decision threshold.</summary>
    public bool HasThreshold => Model.Threshold.HasValue;

    /// <summary>What the generated code is laid out for (the results are the same either way).</summary>
    public OptimizeFor Optimize => Options.Optimize;

    /// <summary>The largest count any table index runs to (decides the width of index types).</summary>
    public long LargestCount =>
        new[] { Visible, (long)Hidden + 1, (long)Visible * Hidden, (long)Hidden * Hidden, LinkCount,
            (long)SelfTest.Count * PackedBytes }.Max();

    /// <summary>
    /// Weight rows added per accumulator update in fixed mode, the same in every target: four (acc += r0 + r1 + r2 +
    /// r3) when optimizing for speed and a sum of four weights always fits the accumulator (4 · (2^15 − 1) &lt; 2^31,
    /// 4 · (2^31 − 1) &lt; 2^63), otherwise one. Integer sums that cannot overflow are exact, so the grouping never
    /// changes a result. Float modes add four rows at a time, acc += (r0 + r1) + (r2 + r3), in every target and
    /// either optimization (rounding depends on the order, so it is fixed).
    /// </summary>
    public abstract int RowsPerAddition { get; }

    /// <summary>Version of emit written into every generated file (major.minor.patch).</summary>
    public static string ToolVersion
    {
        get
        {
            var v = typeof(ScorerPlan).Assembly.GetName().Version ?? new Version(0, 0, 0);
            return $"{v.Major}.{v.Minor}.{Math.Max(0, v.Build)}";
        }
    }

    /// <summary>
    /// "options: …" cut before an option where the line would pass 100 characters; continuation lines are indented to
    /// align with the first option (readers join them: see the harness's banner reader).
    /// </summary>
    private IEnumerable<string> OptionLines(string target)
    {
        const string head = "options: ";
        var line = head;
        foreach (var word in System.Text.RegularExpressions.Regex.Split(Options.BannerText(target), " (?=--)"))
        {
            if (line.Length > head.Length && line.Length + 1 + word.Length > 100)
            {
                yield return line;
                line = new string(' ', head.Length);
            }
            line += (line.Length > head.Length && line.Trim().Length > 0 ? " " : "") + word;
        }
        yield return line;
    }

    /// <summary>
    /// The lines of the banner every generated file starts with (no timestamp: regeneration is byte-stable).
    /// </summary>
    public IReadOnlyList<string> BannerLines(string fileName, string target) =>
    [
        $"{fileName}: generated by emit {ToolVersion} -- do not edit; regenerate with emit compile.",
        $"model: {Naming.CommentText(ModelLabel)} (kind {Model.Kind.ToText()}, {Model.Visible} visible, " +
        $"{Model.Hidden} hidden)",
        $"model sha256: {Model.Sha256}",
        .. OptionLines(target),
        $"layout: optimized for {Options.Optimize.ToText()} (the results do not depend on it)",
        "A monitoring aid, not a safety function.",
    ];
}
