using System.Globalization;

namespace Emit.Detection;

/// <summary>
/// The time between rows of a log, written as a positive number and a unit: <c>250ms</c>, <c>30s</c>, <c>5m</c>,
/// <c>1.5h</c>, <c>1d</c> (ms, s, m = minutes, h, d = 24 h).
/// </summary>
public static class SamplePeriod
{
    /// <summary>Seconds in a day.</summary>
    public const double SecondsPerDay = 86400;

    /// <summary>Parses a period into seconds.</summary>
    public static double ParseSeconds(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var t = text.Trim();
        (string Suffix, double Seconds)[] units = [("ms", 0.001), ("s", 1), ("m", 60), ("h", 3600),
            ("d", SecondsPerDay)];
        foreach (var (suffix, seconds) in units)
        {
            if (!t.EndsWith(suffix, StringComparison.Ordinal)) continue;
            var number = t[..^suffix.Length].TrimEnd();
            if (number.EndsWith('m')) continue; // "5ms" also ends in "s"; the "ms" entry comes first
            if (double.TryParse(number, NumberStyles.AllowDecimalPoint, CultureInfo.InvariantCulture, out double x)
                && x > 0 && double.IsFinite(x * seconds))
                return x * seconds;
            break;
        }
        throw new EmitException($"sample period \"{text}\" is not a duration",
            "write a positive number and a unit: 250ms, 30s, 5m, 1h or 1d");
    }

    /// <summary>Rows per day at a period of <paramref name="seconds"/>.</summary>
    public static double RowsPerDay(double seconds) => SecondsPerDay / seconds;
}
