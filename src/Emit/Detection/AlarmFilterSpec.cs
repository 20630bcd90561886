using System.Globalization;

namespace Emit.Detection;

/// <summary>
/// A K-of-N voting filter (common practice against chattering alarms): the alarm is on at a report when at least
/// <see cref="K"/> of the last <see cref="N"/> reports (this one included) were unusual, 1 ≤ K ≤ N ≤
/// <see cref="MaxN"/>. Written "K/N"; 1/1 is no filtering. Before N reports have arrived the missing ones count as
/// usual.
/// </summary>
public sealed record AlarmFilterSpec
{
    /// <summary>The longest window: the history fits one 32-bit word in generated code.</summary>
    public const int MaxN = 32;

    /// <summary>No filtering: every unusual report raises the alarm.</summary>
    public static AlarmFilterSpec None { get; } = new(1, 1);

    /// <summary>
    /// A filter raising an alarm when <paramref name="k"/> of the last <paramref name="n"/> reports are unusual.
    /// </summary>
    public AlarmFilterSpec(int k, int n)
    {
        if (n < 1 || n > MaxN || k < 1 || k > n)
            throw new EmitException($"alarm filter {k}/{n} is out of range", $"need 1 <= K <= N <= {MaxN}, e.g. 3/5");
        K = k;
        N = n;
    }

    /// <summary>Unusual reports needed within the window.</summary>
    public int K { get; }

    /// <summary>Reports in the window.</summary>
    public int N { get; }

    /// <summary>Parses "K/N" (spaces around the numbers allowed).</summary>
    public static AlarmFilterSpec Parse(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var parts = text.Split('/');
        if (parts.Length == 2
            && int.TryParse(parts[0].Trim(), NumberStyles.None, CultureInfo.InvariantCulture, out int k)
            && int.TryParse(parts[1].Trim(), NumberStyles.None, CultureInfo.InvariantCulture, out int n))
            return new AlarmFilterSpec(k, n);
        throw new EmitException($"alarm filter \"{text}\" is not K/N",
            $"write it like 3/5 (K of the last N reports unusual), 1 <= K <= N <= {MaxN}");
    }

    /// <summary>The spec as written on the command line, "K/N".</summary>
    public override string ToString() => $"{K}/{N}";
}
