namespace Emit.Harness;

/// <summary>
/// Counts of |F_generated − F_reference| in decades split into quarters, from 10^<see cref="MinExponent"/> to
/// 10^<see cref="MaxExponent"/>, plus exact agreements and errors above the range (including not-a-number), so any
/// number of vectors is summarised in constant memory.
/// </summary>
public sealed class ErrorHistogram
{
    /// <summary>Decimal exponent of the lowest bin edge.</summary>
    public const int MinExponent = -18;
    /// <summary>Decimal exponent of the highest bin edge.</summary>
    public const int MaxExponent = 3;
    /// <summary>Bins in each decade.</summary>
    public const int BinsPerDecade = 4;

    private readonly long[] _counts = new long[(MaxExponent - MinExponent) * BinsPerDecade];

    /// <summary>Errors exactly 0.</summary>
    public long Exact { get; private set; }

    /// <summary>Errors below 10^MinExponent (but not 0).</summary>
    public long Below { get; private set; }

    /// <summary>Errors of 10^MaxExponent or more, infinite, or not a number.</summary>
    public long Above { get; private set; }

    /// <summary>Number of bins between 10^MinExponent and 10^MaxExponent.</summary>
    public int BinCount => _counts.Length;

    /// <summary>Count of bin <paramref name="k"/>: errors in [LowerEdge(k), LowerEdge(k + 1)).</summary>
    public long this[int k] => _counts[k];

    /// <summary>Lower edge of bin <paramref name="k"/> as a power of ten.</summary>
    public static double LowerExponent(int k) => MinExponent + k / (double)BinsPerDecade;

    /// <summary>Every error counted: exact, below, in the bins and above.</summary>
    public long Total => Exact + Below + Above + _counts.Sum();

    internal void Add(double error)
    {
        if (error == 0) { Exact++; return; }
        if (!(error < Math.Pow(10, MaxExponent))) { Above++; return; }
        double e = Math.Log10(error);
        if (e < MinExponent) { Below++; return; }
        int k = Math.Clamp((int)Math.Floor((e - MinExponent) * BinsPerDecade), 0, _counts.Length - 1);
        _counts[k]++;
    }
}
