namespace Emit.Harness;

/// <summary>
/// What the harness around a generated scorer must know: the model's size and the width of the result type.
/// </summary>
/// <param name="Visible">Visible units of the model.</param>
/// <param name="EnergyBytes">Bytes of the scorer's energy type: 4 (float, int32) or 8 (double, int64).</param>
public sealed record HarnessLayout(int Visible, int EnergyBytes)
{
    /// <summary>Bytes of a packed input vector (eight units per byte).</summary>
    public int PackedBytes => (Visible + 7) / 8;

    /// <summary>The first line every harness writes.</summary>
    public const string HeaderPrefix = "emit-harness 1 ";

    /// <summary>
    /// Checks a harness's first line (<c>emit-harness 1 selftest N visible V bytes B</c>) against this layout; returns
    /// the self-test failure count, or null with <paramref name="failure"/> set.
    /// </summary>
    public int? ReadHeader(string? line, out string failure)
    {
        failure = "";
        var words = (line ?? "").Split(' ');
        if (words.Length != 8 || line is null || !line.StartsWith(HeaderPrefix, StringComparison.Ordinal)
            || words[2] != "selftest" || words[4] != "visible" || words[6] != "bytes"
            || !int.TryParse(words[3], System.Globalization.NumberStyles.AllowLeadingSign,
                System.Globalization.CultureInfo.InvariantCulture, out int selfTest)
            || !int.TryParse(words[5], System.Globalization.CultureInfo.InvariantCulture, out int visible)
            || !int.TryParse(words[7], System.Globalization.CultureInfo.InvariantCulture, out int bytes))
        {
            failure = $"the harness did not start as expected (first line: \"{Shorten(line)}\")";
            return null;
        }
        if (visible != Visible)
        {
            failure = $"the generated scorer has {visible} visible units, the model {Visible}: the sources are for " +
                "another model";
            return null;
        }
        if (bytes != EnergyBytes)
        {
            failure = $"the generated scorer's result has {bytes} bytes, expected {EnergyBytes} for this numeric mode";
            return null;
        }
        return selfTest;
    }

    /// <summary>
    /// Parses one result line: hex bits, same-bits flag, decision, then any feature groups (<c>NAME:FIELDS</c>, FIELDS
    /// without spaces) that the harness writes for the firmware features emitted beside the scorer.
    /// </summary>
    public bool TryParseRow(string? line, out ScoredRow row)
    {
        row = default;
        if (line is null) return false;
        var words = line.Split(' ');
        if (words.Length < 3 || words[0].Length != 2 * EnergyBytes) return false;
        if (!ulong.TryParse(words[0], System.Globalization.NumberStyles.AllowHexSpecifier,
            System.Globalization.CultureInfo.InvariantCulture, out var bits)) return false;
        if (words[1] is not ("0" or "1")) return false;
        sbyte decision = words[2] switch { "1" => 1, "0" => 0, "-1" => -1, _ => sbyte.MinValue };
        if (decision == sbyte.MinValue) return false;
        string? features = null;
        if (words.Length > 3)
        {
            if (words.Skip(3).Any(w => w.IndexOf(':', StringComparison.Ordinal) <= 0)) return false;
            features = string.Join(' ', words.Skip(3));
        }
        row = new ScoredRow(bits, words[1] == "1", decision, features);
        return true;
    }

    /// <summary>A line cut to 120 characters for messages.</summary>
    public static string Shorten(string? line) =>
        line is null ? "(no output)" : line.Length > 120 ? line[..120] + "..." : line;
}
