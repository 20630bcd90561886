using System.Collections;
using System.Globalization;
using Emit.Model;
using Emit.Quantize;
using Scriban.Runtime;

namespace Emit.Emission.Dialects;

/// <summary>
/// What one output language adds to a target-neutral <see cref="ScorerPlan"/>: the identifiers (through
/// <see cref="Naming"/>, the one naming authority), literal syntax, the type map and comment syntax. Templates read the
/// dialect as <c>d</c> and call its formatting functions (<see cref="Register"/>); the plan (<c>p</c>) holds only
/// numbers, formats, ranges and tables.
/// </summary>
public abstract class TargetDialect
{
    /// <summary>Width no generated line exceeds.</summary>
    public const int MaxLineLength = 120;

    private protected static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private protected TargetDialect(ScorerPlan plan)
    {
        Plan = plan;
    }

    /// <summary>The plan laid out.</summary>
    public ScorerPlan Plan { get; }

    /// <summary>The target name used with <c>--target</c>.</summary>
    public abstract string Target { get; }

    /// <summary>Identifiers of the visible units (one per unit; empty when the model names none).</summary>
    public abstract IReadOnlyList<string> UnitIdentifiers { get; }

    /// <summary>
    /// The type of a free energy value as returned to callers (C and C# spell float and double alike).
    /// </summary>
    public virtual string EnergyType => Plan.Mode switch
    {
        NumericMode.F32 => "float",
        NumericMode.F64 => "double",
        _ => AccType,
    };

    /// <summary>Fixed mode: the accumulator type of the plan.</summary>
    private protected AccumulatorType Acc => ((FixedScorerPlan)Plan).Accumulator;

    /// <summary>Fixed mode: the accumulator type (the energy type's width).</summary>
    public abstract string AccType { get; }

    /// <summary>Fixed mode: the stored weight type.</summary>
    public abstract string WeightType { get; }

    /// <summary>Fixed mode: the softplus table's entry type.</summary>
    public abstract string EntryType { get; }

    /// <summary>The type of unit and table indices.</summary>
    public abstract string IndexType { get; }

    /// <summary>An integer literal of the accumulator type.</summary>
    public abstract string Int(long value);

    /// <summary>An index literal (unsigned where the language has the suffix).</summary>
    public abstract string Index(long value);

    /// <summary>
    /// A block comment of paragraphs at <paramref name="indent"/>, wrapped to <see cref="MaxLineLength"/>.
    /// </summary>
    public abstract string Comment(IEnumerable<string> paragraphs, string indent);

    /// <summary>An unsigned 32-bit hexadecimal literal (the same syntax in C99 and C#): <c>0x0000001Fu</c>.</summary>
    public static string Hex32(long value) => "0x" + ((uint)value).ToString("X8", Inv) + "u";

    /// <summary>
    /// A real literal of the plan's float mode (the syntax is shared by C99 and C#, see <see cref="Literals"/>).
    /// </summary>
    public string Real(double value) => Literals.Of(value, Plan.Mode);

    /// <summary>The literal of the smallest value of the mode at or above <paramref name="value"/>.</summary>
    public string RealUp(double value) => Literals.Upward(value, Plan.Mode);

    /// <summary>
    /// The literal of a stated bound in nats: a float literal in f32 (so comparing it with a float does not promote to
    /// double), a double literal otherwise, rounded up.
    /// </summary>
    public string Bound(double value) =>
        Literals.Upward(value, Plan.Mode == NumericMode.F32 ? NumericMode.F32 : NumericMode.F64);

    /// <summary>The real value q / 2^n, 7 significant digits, for review comments.</summary>
    public static string RealOf(long q, int fractionBits) => Math.ScaleB((double)q, -fractionBits).ToString("G7", Inv);

    /// <summary>
    /// Values as initialiser items followed by commas, at most <paramref name="perLine"/> to a line and no line longer
    /// than <see cref="MaxLineLength"/>, each line indented.
    /// </summary>
    public string Wrap(object values, int perLine, string indent, string format)
    {
        Func<object, string> item = format switch
        {
            "lit" => v => Real(Convert.ToDouble(v, Inv)),
            "lit_up" => v => RealUp(Convert.ToDouble(v, Inv)),
            "int" => v => Int(Convert.ToInt64(v, Inv)),
            "index" => v => Index(Convert.ToInt64(v, Inv)),
            "dec" => v => Convert.ToInt64(v, Inv).ToString(Inv),
            "hex" => v => "0x" + Convert.ToByte(v, Inv).ToString("X2", Inv),
            _ => throw new InvalidOperationException($"unknown table format \"{format}\""),
        };
        var sb = new System.Text.StringBuilder();
        int onLine = 0, lineStart = 0;
        foreach (var v in (IEnumerable)values)
        {
            var text = item(v!) + ",";
            bool full = onLine == perLine || (onLine > 0 && sb.Length - lineStart + 1 + text.Length > MaxLineLength);
            if (onLine == 0 || full)
            {
                if (sb.Length > 0) sb.Append('\n');
                lineStart = sb.Length;
                sb.Append(indent);
                onLine = 0;
            }
            else sb.Append(' ');
            sb.Append(text);
            onLine++;
        }
        return sb.ToString();
    }

    /// <summary>Row <paramref name="row"/> of a row-major table with <paramref name="width"/> columns.</summary>
    public static IReadOnlyList<object> Row(object values, int row, int width)
    {
        // Indexed, not Skip/Take: a table of V rows would otherwise cost V² steps (600 000 visible units took minutes).
        if (values is IList list)
        {
            long start = (long)row * width;
            int n = (int)Math.Clamp(list.Count - start, 0, width);
            var result = new object[n];
            for (int k = 0; k < n; k++) result[k] = list[(int)(start + k)]!;
            return result;
        }
        return ((IEnumerable)values).Cast<object>().Skip(row * width).Take(width).ToArray();
    }

    /// <summary>
    /// Paragraphs wrapped so that <paramref name="prefix"/> plus a line fits <see cref="MaxLineLength"/>, each line
    /// prefixed.
    /// </summary>
    public static string Prefixed(IEnumerable<string> paragraphs, string prefix) =>
        string.Join("\n",
            Paragraphs.Wrap(paragraphs, MaxLineLength - prefix.Length).Select(l => (prefix + l).TrimEnd()));

    /// <summary>
    /// The comment for unit <paramref name="i"/>'s identifier: the unit's name, or empty when the identifier already
    /// says it (the same letters and digits, ignoring case), so no comment repeats the name it follows.
    /// </summary>
    public string UnitNote(int i)
    {
        static string Key(string s) => new(s.Where(char.IsAsciiLetterOrDigit).Select(char.ToLowerInvariant).ToArray());
        var note = Plan.UnitComments[i];
        return Key(note) == Key(UnitIdentifiers[i]) ? "" : note;
    }

    /// <summary>"expr - k", "expr + |k|" for negative k, or "expr" for 0: no "x - (-4)" in generated code.</summary>
    public static string Minus(string expr, long k) =>
        k == 0 ? expr : k < 0 ? expr + " + " + (-k).ToString(Inv) : expr + " - " + k.ToString(Inv);

    private static IEnumerable<string> Lines(object lines) =>
        lines is string one ? [one] : ((IEnumerable)lines).Cast<object>().Select(l => Convert.ToString(l, Inv) ?? "");

    /// <summary>Text safe inside an XML documentation comment.</summary>
    public static string Xml(string text) =>
        text.Replace("&", "&amp;", StringComparison.Ordinal).Replace("<", "&lt;", StringComparison.Ordinal)
            .Replace(">", "&gt;", StringComparison.Ordinal);

    /// <summary>The banner lines of a generated file (no timestamp, so regeneration is byte-stable).</summary>
    public IReadOnlyList<string> Banner(string fileName) => Plan.BannerLines(fileName, Target);

    /// <summary>Kind of model as text ("rbm", "lateral", "general").</summary>
    public string Kind => Plan.Model.Kind.ToText();

    /// <summary>The mode as text ("f32", "f64", "fixed").</summary>
    public string Mode => Plan.Mode.ToText();

    /// <summary>
    /// Puts the dialect (<c>d</c>), the plan (<c>p</c>) and the formatting functions on the script object: <c>lit</c>,
    /// <c>lit_up</c>, <c>bound</c>, <c>double_up</c>, <c>int</c>, <c>index</c>, <c>real</c>, <c>label</c>,
    /// <c>items</c>, <c>row</c>,
    /// <c>comment</c>, <c>prefixed</c>, <c>xml</c>.
    /// </summary>
    public virtual void Register(ScriptObject globals)
    {
        globals.SetValue("p", Plan, readOnly: true);
        globals.SetValue("d", this, readOnly: true);
        globals.Import("lit", new Func<double, string>(Real));
        globals.Import("lit_up", new Func<double, string>(RealUp));
        globals.Import("bound", new Func<double, string>(Bound));
        globals.Import("double_up", new Func<double, string>(v => Literals.Upward(v, NumericMode.F64)));
        globals.Import("int", new Func<long, string>(Int));
        globals.Import("index", new Func<long, string>(Index));
        globals.Import("hex32", new Func<long, string>(Hex32));
        globals.Import("real", new Func<long, int, string>(RealOf));
        globals.Import("label", new Func<int, string>(Plan.UnitLabel));
        globals.Import("items", new Func<object, int, string, string, string>(Wrap));
        globals.Import("row", new Func<object, int, int, IReadOnlyList<object>>(Row));
        globals.Import("comment", new Func<object, string, string>((lines, indent) => Comment(Lines(lines), indent)));
        globals.Import("prefixed", new Func<object, string, string>((lines, prefix) => Prefixed(Lines(lines), prefix)));
        globals.Import("xml", new Func<string, string>(Xml));
        globals.Import("xml_prefixed", new Func<object, string,
            string>((lines, prefix) => Prefixed(Lines(lines).Select(Xml), prefix)));
        globals.Import("minus", new Func<string, long, string>(Minus));
        globals.Import("unit_note", new Func<int, string>(UnitNote));
        globals.Import("banner_lines", new Func<string, IReadOnlyList<string>>(Banner));
    }
}
