namespace Emit.Detection;

/// <summary>
/// A two-sided confidence interval [<see cref="Low"/>, <see cref="High"/>] for a rate, with its confidence level.
/// </summary>
public readonly record struct RateInterval(double Low, double High, double Confidence)
{
    /// <summary>
    /// Both ends multiplied by <paramref name="factor"/> (a rate per row turned into a rate per 1000 rows or per day).
    /// </summary>
    public RateInterval Scale(double factor) => new(Low * factor, High * factor, Confidence);
}
