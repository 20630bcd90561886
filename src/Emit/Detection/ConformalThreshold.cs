namespace Emit.Detection;

/// <summary>
/// The conformal threshold: with n normal calibration free energies and a false-alarm rate A, the threshold is the
/// k-th smallest of them, k = ⌈(n + 1)(1 − A)⌉. For a new normal vector exchangeable with the calibration set,
/// P(F &gt; t) ≤ A (Vovk, Gammerman &amp; Shafer, "Algorithmic Learning in a Random World", Springer 2005; the rank
/// of the new score among n + 1 is uniform). When k &gt; n there is too little data for A.
/// A is taken as the decimal number written (0.01 is one hundredth), so ranks do not depend on binary rounding.
/// </summary>
public static class ConformalThreshold
{
    /// <summary>The rank k = ⌈(n + 1)(1 − A)⌉ = (n + 1) − ⌊(n + 1)·A⌋, or throws when k &gt; n.</summary>
    public static long Rank(long n, double falseAlarm)
    {
        var a = CheckRate(falseAlarm);
        if (n < 1) throw new EmitException("calibration needs at least one normal vector");
        long k = (n + 1) - (long)decimal.Floor((n + 1) * a);
        if (k > n)
            throw new EmitException(
                $"{n} normal vectors are too few for a false-alarm rate of {Text(falseAlarm)}: the threshold would " +
                $"be the {k}-th smallest free energy",
                $"a false-alarm rate of {Text(falseAlarm)} needs at least {MinimumVectors(falseAlarm)} normal " +
                "vectors; give more data or a larger rate");
        return k;
    }

    /// <summary>The fewest normal vectors n with k ≤ n, i.e. (n + 1)·A ≥ 1: n = ⌈1/A⌉ − 1.</summary>
    public static long MinimumVectors(double falseAlarm)
    {
        var a = CheckRate(falseAlarm);
        return (long)decimal.Ceiling(1m / a) - 1;
    }

    /// <summary>True when <paramref name="n"/> vectors are enough for <paramref name="falseAlarm"/>.</summary>
    public static bool Enough(long n, double falseAlarm) => n >= MinimumVectors(falseAlarm);

    /// <summary>The threshold: the k-th smallest of <paramref name="energies"/> (any order; not modified).</summary>
    public static double Threshold(IReadOnlyList<double> energies, double falseAlarm)
    {
        long k = Rank(energies.Count, falseAlarm);
        var sorted = energies.ToArray();
        Array.Sort(sorted);
        return sorted[k - 1];
    }

    /// <summary>
    /// As <see cref="Threshold(IReadOnlyList{double}, double)"/> on energies already sorted ascending.
    /// </summary>
    public static double ThresholdOfSorted(IReadOnlyList<double> sorted, double falseAlarm) =>
        sorted[(int)(Rank(sorted.Count, falseAlarm) - 1)];

    private static decimal CheckRate(double falseAlarm)
    {
        if (!(falseAlarm > 0 && falseAlarm < 1) || !double.IsFinite(falseAlarm))
            throw new EmitException($"false-alarm rate {Text(falseAlarm)} is not between 0 and 1",
                "give a rate like 0.01 (one in a hundred normal reports)");
        if (falseAlarm < 1e-12)
            throw new EmitException($"false-alarm rate {Text(falseAlarm)} is too small to calibrate from data",
                "use a rate of at least 1e-12");
        return (decimal)falseAlarm;
    }

    internal static string Text(double x) => x.ToString("R", System.Globalization.CultureInfo.InvariantCulture);
}
