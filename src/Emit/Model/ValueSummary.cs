namespace Emit.Model;

/// <summary>Summary of a set of numbers: count, min, max, mean, standard deviation, mean |x|.</summary>
public sealed record ValueSummary(long Count, double Min, double Max, double Mean, double Std, double MeanAbs)
{
    /// <summary>Count, range, mean and spread of <paramref name="values"/>.</summary>
    public static ValueSummary Of(IEnumerable<double> values)
    {
        long n = 0;
        double min = double.PositiveInfinity, max = double.NegativeInfinity, sum = 0, sumSq = 0, sumAbs = 0;
        foreach (var x in values)
        {
            n++;
            min = Math.Min(min, x);
            max = Math.Max(max, x);
            sum += x;
            sumSq += x * x;
            sumAbs += Math.Abs(x);
        }
        if (n == 0) return new ValueSummary(0, 0, 0, 0, 0, 0);
        double mean = sum / n;
        return new ValueSummary(n, min, max, mean, Math.Sqrt(Math.Max(0, sumSq / n - mean * mean)), sumAbs / n);
    }
}
