using System.Globalization;
using System.Text;

namespace Emit.Emission;

/// <summary>Lays out long initialiser lists as text (built in C#, not in templates, so any size renders quickly).</summary>
internal static class TableText
{
    /// <summary>Items followed by commas, <paramref name="perLine"/> to a line, each line indented and ended by "\n".</summary>
    public static void Wrap(StringBuilder sb, IReadOnlyList<string> items, int perLine, string indent)
    {
        for (int k = 0; k < items.Count; k += perLine)
        {
            sb.Append(indent);
            int end = Math.Min(items.Count, k + perLine);
            for (int n = k; n < end; n++)
            {
                if (n > k) sb.Append(' ');
                sb.Append(items[n]).Append(',');
            }
            sb.Append('\n');
        }
    }

    public static string Wrap(IReadOnlyList<string> items, int perLine, string indent)
    {
        var sb = new StringBuilder();
        Wrap(sb, items, perLine, indent);
        return sb.ToString();
    }

    public static string Hex(byte b) => "0x" + b.ToString("X2", CultureInfo.InvariantCulture);

    public static string Int(long n) => n.ToString(CultureInfo.InvariantCulture);

    /// <summary>The comment naming visible unit i: "i: name" or "unit i".</summary>
    public static string UnitLabel(ScorerPlan plan, int i) =>
        plan.UnitComments.Count > 0 ? Int(i) + ": " + plan.UnitComments[i] : "unit " + Int(i);
}
