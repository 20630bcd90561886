using System.Globalization;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission.Dialects;

/// <summary>
/// The prose of a fixed-point scorer's comments (formats, the threshold, each function's "scaling and overflow"
/// paragraph), with the numbers taken from the plan's range analysis (<see cref="FixedPointPlan.Checks"/>) and the
/// type names from the target's dialect. Templates print these paragraphs with the dialect's comment syntax.
/// </summary>
public sealed class FixedComments
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private readonly FixedScorerPlan p;
    private readonly TargetDialect _d;
    private readonly string _bound;

    /// <summary>
    /// Comments for <paramref name="plan"/> in <paramref name="dialect"/>; <paramref name="boundName"/> names the error
    /// bound constant.
    /// </summary>
    public FixedComments(FixedScorerPlan plan, TargetDialect dialect, string boundName)
    {
        p = plan;
        _d = dialect;
        _bound = boundName;
    }

    private static string Int(Int128 v) => v.ToString(Inv);

    private static string Range(IntRange r) => "[" + Int(r.Min) + ", " + Int(r.Max) + "]";

    /// <summary>"Q15.16 (3 units), Q16.15 (2 units)" or a single format.</summary>
    public static string FormatList(IEnumerable<QFormat> formats)
    {
        var groups = formats.GroupBy(f => f).OrderByDescending(g => g.Count()).ThenBy(g => g.Key.FractionBits).ToList();
        if (groups.Count == 1) return groups[0].Key.ToString();
        return string.Join(", ",
            groups.Select(g => g.Key + " (" + g.Count().ToString(Inv) + (g.Count() == 1 ? " unit)" : " units)")));
    }

    private string Guard(IntRange r)
    {
        int g = p.GuardBits(r);
        return g.ToString(Inv) + (g == 1 ? " guard bit" : " guard bits") + " in " + p.AccumulatorBits.ToString(Inv);
    }

    private static IntRange Hull(IntRange? a, IntRange? b) =>
        a is { } x ? (b is { } y ? x.Hull(y) : x) : b ?? IntRange.Point(0);

    /// <summary>"weight column Q15-f_j.f_j, accumulator Q31-f_j.f_j".</summary>
    public string FractionBitsFormats =>
        $"weight column Q{p.WeightBits - 1}-f_j.f_j, accumulator Q{p.AccumulatorBits - 1}-f_j.f_j";

    /// <summary>Header comment of the fixed-point formats section (paragraphs).</summary>
    private IReadOnlyList<string> FormatsParagraphs()
    {
        var f = p.Fixed;
        var lines = new List<string>
        {
            "Integer arithmetic only: no floating point, no division, no library call in the source. Q notation: a " +
                "Qm.n value is an " +
            "integer q standing for q / 2^n (m integer bits, n fraction bits, one sign bit; UQ has no sign bit).",
            $"  free energy, visible biases{(p.Model.Kind == ModelKind.General ? ", hidden links, scores" : "")}: " +
            $"{f.EnergyFormat} ({p.AccumulatorBits}-bit)",
        };
        if (p.Hidden > 0)
        {
            lines.Add($"  weights W ({_d.WeightType}): {f.WeightFormatSummary}; each hidden unit j has its own " +
                      "fraction bits f_j, shared by its weight column, bias and accumulator");
            lines.Add($"  hidden accumulators ({_d.AccType}): {f.AccumulatorFormatSummary}");
            lines.Add(
                $"  softplus table ({_d.EntryType}): {f.Table.EntryFormat}, {p.TableSegments} segments over [0, " +
                $"{f.Table.Range.ToString("R", Inv)}]");
        }
        if (!f.Lateral.IsEmpty)
            lines.Add(
                $"  lateral weights ({_d.WeightType}): {f.LateralFormat}; lateral sum: " +
                $"{new QFormat(p.AccumulatorBits, f.LateralFractionBits)}");
        lines.Add(
            "Rounding: half away from zero, both for the constants (emit rounds them) and wherever bits are dropped " +
            "at " +
                  "run time (half an LSB is added to the magnitude, which is shifted and given back its sign: no " +
                  "negative value " +
                  "is ever shifted right).");
        lines.Add(
            "Overflow: emit's range analysis proves that every intermediate stays within " +
            $"+-(2^{p.AccumulatorBits - 1} - 1) for " +
                  "every binary input, so nothing saturates or wraps; each function's \"scaling and overflow\" " +
                  "comment gives the " +
                  "ranges (derivation: docs/fixed-point.md in the emit sources).");
        return lines;
    }

    /// <summary>The threshold comment (paragraphs).</summary>
    private IReadOnlyList<string> ThresholdParagraphs()
    {
        var t = p.Model.Threshold!.Value;
        int e = p.EnergyFractionBits;
        string tt = t.ToString("R", Inv);
        return
        [
            $"An input is unusual when its free energy f > this: the model's threshold {tt} nats times 2^{e}, " +
                "rounded down" +
            $"{(p.ThresholdClamped ? " and clamped to the reachable results" : "")}, so f > this exactly when f / " +
            $"2^{e} > {tt}. " +
            "Decisions can differ from the exact scorer's only for inputs whose exact free energy lies within " +
            $"{_bound} nats " +
            "of the threshold.",
        ];
    }

    private IReadOnlyList<string> ToEnergyParagraphs()
    {
        var f = p.Fixed;
        var mid = Hull(p.UnitCheckHull("to_energy"), p.TryCheck("lateral.to_energy"));
        var callers = new List<string>();
        if (p.Hidden > 0)
        {
            var s = f.Units.Select(u => u.EnergyShift).ToArray();
            callers.Add(p.Model.Kind == ModelKind.General
                ? $"the hidden scores (s = f_j - E, {Span(s)})"
                : $"the positive part of softplus (s = f_j - E, {Span(s)})");
        }
        if (!f.Lateral.IsEmpty) callers.Add($"the lateral sum (s = f_L - E = {f.LateralShift.ToString(Inv)})");
        return
        [
            $"to_energy(x, s): x has E + s fraction bits; the result has E = {p.EnergyFractionBits} " +
                $"({f.EnergyFormat}). " +
            "s > 0 drops s bits, rounding half away from zero: half an LSB is added to the magnitude, which is " +
            "shifted " +
            "right and given back its sign, so no negative value is shifted. s <= 0 multiplies by the constant 2^-s.",
            $"Scaling and overflow: used for {string.Join(" and ", callers)}; over all inputs the intermediate " +
            $"(|x| + 2^(s-1), or x * 2^-s) lies in {Range(mid)} ({Guard(mid)}).",
        ];
    }

    private static string Span(IReadOnlyCollection<int> values)
    {
        int lo = values.Min(), hi = values.Max();
        return lo == hi ? lo.ToString(Inv) : lo.ToString(Inv) + " to " + hi.ToString(Inv);
    }

    private IReadOnlyList<string> LookupParagraphs()
    {
        var f = p.Fixed;
        var product = Hull(p.UnitCheckHull("interpolation_product"), p.TryCheck("general.lse.interpolation_product"));
        var limit = Hull(p.UnitCheckHull("table_limit"), p.TryCheck("general.lse.table_limit"));
        var d = p.Model.Kind == ModelKind.General ? [f.LseTableShift] : f.Units.Select(u => u.TableShift).ToArray();
        return
        [
            $"G_q(mag, d) = 2^E * G(mag / 2^(e + d)) for mag >= 0 with e + d fraction bits, G(x) = log(1 + e^-x), " +
            $"E = {p.EnergyFractionBits}, e = {p.TableStepBits.ToString(Inv)} (segment width h = 2^-e): segment k = " +
            "mag >> d, " +
            "position r = mag & (2^d - 1), linear interpolation T[k+1] + ((T[k] - T[k+1]) * (2^d - r) + 2^(d-1)) >> " +
            "d " +
            $"from non-negative terms, rounding half up; 0 beyond the table (mag >= N * 2^d, N = {p.TableSegments}), " +
            "where G < e^-R.",
            $"Scaling and overflow: d = {Span(d)}; the limit N * 2^d is at most {Int(limit.Max)} and the " +
            "interpolation " +
            $"product plus half at most {Int(product.Max)} ({Guard(product)}); table entries lie in [0, " +
            $"{f.Table.Entries[0].ToString(Inv)}].",
        ];
    }

    private IReadOnlyList<string> SoftplusParagraphs()
    {
        var f = p.Fixed;
        var acc = p.UnitCheckHull("accumulator")!.Value;
        var outRange = p.UnitCheckHull("softplus")!.Value;
        return
        [
            "softplus_q(a, f) = (a > 0 ? to_energy(a, f - E) : 0) + G_q(|a|, f - e), from softplus(x) = max(x, 0) + " +
                "G(|x|).",
            $"Scaling and overflow: a is a hidden accumulator with f fraction bits ({f.AccumulatorFormatSummary}). " +
            "Over all " +
            $"inputs a lies in {Range(acc)} ({Guard(acc)}), so -a cannot overflow; the result, in {f.EnergyFormat}, " +
            $"lies in {Range(outRange)}.",
        ];
    }

    private IReadOnlyList<string> Lse2Paragraphs()
    {
        var tree = p.Check("general.tree").Range;
        var diff = p.Check("general.difference").Range;
        return
        [
            "lse2(a, b) = max(a, b) + G_q(|a - b|, d_E) approximates log(e^a + e^b) for a, b in " +
                $"{p.Fixed.EnergyFormat}; " +
            $"d_E = E - e = {p.Fixed.LseTableShift.ToString(Inv)}.",
            $"Scaling and overflow: a, b and the result lie in {Range(tree)}; |a - b| <= {Int(diff.Max)} " +
            $"({Guard(diff)}).",
        ];
    }

    private IReadOnlyList<string> LogSumExpParagraphs()
    {
        var z = p.UnitCheckHull("score_term")!.Value;
        var field = p.UnitCheckHull("field")!.Value;
        var score = p.Check("general.score").Range;
        var tree = p.Check("general.tree").Range;
        return
        [
            "log sum_h exp(s(h)) over all 2^HIDDEN hidden states, s(h) = z.h + sum_{k<l} M_kl h_k h_l, z_k = " +
                "to_energy(a_k, f_k - E). " +
            "The states are visited in Gray-code order: step t flips unit k = (trailing zero bits of t), and the " +
            "score and " +
            "the fields (field_l = change of the score when unit l flips) are updated by additions. Each score is " +
            "merged " +
            "into partial[] like a binary counter, so lse2 is applied along a balanced tree of depth HIDDEN.",
            $"Scaling and overflow: everything in {p.Fixed.EnergyFormat}; z_k lies in {Range(z)}, the fields in " +
            $"{Range(field)}, " +
            $"the scores in {Range(score)} and the merged values in {Range(tree)} ({Guard(tree)}).",
        ];
    }

    private IReadOnlyList<string> FreeEnergyParagraphs()
    {
        var f = p.Fixed;
        bool general = p.Model.Kind == ModelKind.General;
        var walk = "F(v) = -b.v - sum_{i<j} L_ij v_i v_j - " +
            (general ? "log sum_h exp(a.h + sum_{k<l} M_kl h_k h_l)" : "sum_j softplus(a_j)") +
                   ", a = c + sum_{i on} W_i. For each set bit (bytes in order, lowest set bit first) the unit's " +
                   "bias joins the energy" +
                   (f.Lateral.IsEmpty ? "" : ", its links to active lower-numbered units join the lateral sum");
        if (p.Hidden > 0)
            walk += p.RowsPerAddition == 4
                ? ", and its weight row is added to the hidden accumulators, four rows at a time (acc += r0 + r1 + " +
                "r2 + r3; " +
                  $"the weights are {p.WeightBits}-bit, so the sum of four always fits the {p.AccumulatorBits}-bit " +
                  "accumulator)."
                : ", and its weight row is added to the hidden accumulators, one row at a time.";
        else walk += ".";
        var lines = new List<string>
        {
            walk + " Integer additions that cannot overflow are exact, so the order of the walk does not change the " +
                "result.",
            "Scaling and overflow (ranges over all binary inputs, each holding every partial sum):",
        };
        if (p.Hidden > 0)
        {
            var acc = p.UnitCheckHull("accumulator")!.Value;
            lines.Add($"  hidden accumulators, {f.AccumulatorFormatSummary}: {Range(acc)} ({Guard(acc)})");
        }
        var linear = p.Check("energy.linear").Range;
        lines.Add(
            $"  energy ({f.EnergyFormat}), starting at K = {f.EnergyOffset.ToString(Inv)} plus the visible biases: " +
            $"{Range(linear)}");
        if (!f.Lateral.IsEmpty)
        {
            var lat = p.Check("lateral.accumulator").Range;
            lines.Add(
                $"  lateral sum ({new QFormat(p.AccumulatorBits, f.LateralFractionBits)}): {Range(lat)} " +
                $"({Guard(lat)}); " +
                      $"energy after adding it: {Range(p.Check("energy.base").Range)}");
        }
        var sum = p.Check("energy.sum").Range;
        lines.Add(
            $"  energy after the hidden part: {Range(sum)} ({Guard(sum)}); result -energy: {Range(p.ResultRange)}");
        lines.Add(
            $"No saturation is needed. Accuracy: |result / 2^{p.EnergyFractionBits} - exact F| <= {_bound} nats for " +
            "every input.");
        return lines;
    }

    /// <summary>The hidden accumulators' formats ("Q15.16 (3 units), Q16.15 (2 units)").</summary>
    public string HiddenFormats => FormatList(p.Fixed.Units.Select(u => u.AccumulatorFormat));

    /// <summary>The weight columns' formats.</summary>
    public string WeightFormats => FormatList(p.Fixed.Units.Select(u => u.WeightFormat));

    /// <summary>The softplus table's segment width ("2^-4").</summary>
    public string TableStep => "2^" + (-p.TableStepBits).ToString(Inv);

    /// <summary>The end of the softplus table's range.</summary>
    public string TableRange => p.Fixed.Table.Range.ToString("R", Inv);

    /// <summary>
    /// The softplus table in lines of eight entries, each line with its first and last index and node.
    /// </summary>
    public IReadOnlyList<TableChunk> TableChunks
    {
        get
        {
            var t = p.Fixed.Table;
            var chunks = new List<TableChunk>();
            for (int k = 0; k < t.Entries.Length; k += 8)
            {
                int end = Math.Min(t.Entries.Length, k + 8) - 1;
                chunks.Add(new TableChunk(t.Entries.Skip(k).Take(end - k + 1).Select(e => (long)e).ToArray(), k, end,
                    t.Node(k).ToString("R", Inv), t.Node(end).ToString("R", Inv)));
            }
            return chunks;
        }
    }

    /// <summary>Paragraphs of the "Formats" comment.</summary>
    public IReadOnlyList<string> Formats => FormatsParagraphs();

    /// <summary>Paragraphs of the "Threshold" comment.</summary>
    public IReadOnlyList<string> Threshold => ThresholdParagraphs();

    /// <summary>Paragraphs of the "ToEnergy" comment.</summary>
    public IReadOnlyList<string> ToEnergy => ToEnergyParagraphs();

    /// <summary>Paragraphs of the "Lookup" comment.</summary>
    public IReadOnlyList<string> Lookup => LookupParagraphs();

    /// <summary>Paragraphs of the "Softplus" comment.</summary>
    public IReadOnlyList<string> Softplus => SoftplusParagraphs();

    /// <summary>Paragraphs of the "Lse2" comment.</summary>
    public IReadOnlyList<string> Lse2 => Lse2Paragraphs();

    /// <summary>Paragraphs of the "LogSumExp" comment.</summary>
    public IReadOnlyList<string> LogSumExp => LogSumExpParagraphs();

    /// <summary>Paragraphs of the "FreeEnergy" comment.</summary>
    public IReadOnlyList<string> FreeEnergy => FreeEnergyParagraphs();
}
