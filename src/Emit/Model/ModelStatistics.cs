namespace Emit.Model;

/// <summary>What <c>emit inspect</c> reports about a model, computed once.</summary>
public sealed record ModelStatistics(
    ValueSummary Weights,
    ValueSummary VisibleBias,
    ValueSummary HiddenBias,
    ValueSummary VisibleLinks,
    ValueSummary HiddenLinks,
    IReadOnlyList<InputRange> HiddenInputRanges,
    IReadOnlyDictionary<string, long> TableBytes)
{
    /// <summary>Bytes per stored value for each table width reported by inspect.</summary>
    public static readonly IReadOnlyList<(string Name, int Bytes)> Widths = [("f64", 8), ("f32", 4), ("int16", 2),
        ("int8", 1)];

    /// <summary>Statistics of the parameters of <paramref name="m"/>.</summary>
    public static ModelStatistics Of(BoltzmannModel m)
    {
        var bytes = new Dictionary<string, long>();
        long values = (long)m.Visible * m.Hidden + m.Visible + m.Hidden;
        long links = m.VisibleLinks.Length + m.HiddenLinks.Length;
        foreach (var (name, size) in Widths)
            bytes[name] = values * size + links * (size + 4); // a link stores its weight and two uint16 indices
        return new ModelStatistics(
            ValueSummary.Of(m.Weights),
            ValueSummary.Of(m.VisibleBias),
            ValueSummary.Of(m.HiddenBias),
            ValueSummary.Of(m.VisibleLinks.Select(l => l.W)),
            ValueSummary.Of(m.HiddenLinks.Select(l => l.W)),
            HiddenRanges(m),
            bytes);
    }

    /// <summary>
    /// Per hidden unit j: min = c_j + Σ_i min(0, W_ij), max = c_j + Σ_i max(0, W_ij). Exact: each visible unit
    /// contributes independently, so the extreme vector turns on exactly the units of one sign.
    /// </summary>
    public static InputRange[] HiddenRanges(BoltzmannModel m)
    {
        var lo = m.HiddenBias.ToArray();
        var hi = m.HiddenBias.ToArray();
        for (int i = 0; i < m.Visible; i++)
        {
            var row = m.WeightRow(i);
            for (int j = 0; j < m.Hidden; j++)
            {
                double w = row[j];
                if (w < 0) lo[j] += w; else hi[j] += w;
            }
        }
        var r = new InputRange[m.Hidden];
        for (int j = 0; j < m.Hidden; j++) r[j] = new InputRange(lo[j], hi[j]);
        return r;
    }
}
