namespace Emit.Detection;

/// <summary>
/// ROC analysis of free energies, anomalies being the positive class and higher F meaning more unusual.
/// The area is the Mann–Whitney probability P(F_anomaly &gt; F_normal) + ½ P(F_anomaly = F_normal): ties count half,
/// which is the trapezoidal area under the curve through every distinct threshold (Hanley &amp; McNeil,
/// Radiology 143(1), 1982).
/// </summary>
public static class Roc
{
    /// <summary>The area under the ROC curve; needs at least one value in each set.</summary>
    public static double Auc(IReadOnlyList<double> normal, IReadOnlyList<double> anomalies)
    {
        Check(normal, anomalies);
        var n = Sorted(normal);
        var a = Sorted(anomalies);
        // For each anomaly count the normals below it and those equal to it, walking both sorted lists once.
        double wins = 0;
        int below = 0, upTo = 0;
        foreach (var x in a)
        {
            while (below < n.Length && n[below] < x) below++;
            if (upTo < below) upTo = below;
            while (upTo < n.Length && n[upTo] <= x) upTo++;
            wins += below + 0.5 * (upTo - below);
        }
        return wins / ((double)n.Length * a.Length);
    }

    /// <summary>
    /// The ROC curve: one point per distinct free energy (as threshold), from (1, 1) below every value down to (0, 0)
    /// at the largest, in order of increasing threshold.
    /// </summary>
    public static IReadOnlyList<RocPoint> Curve(IReadOnlyList<double> normal, IReadOnlyList<double> anomalies)
    {
        Check(normal, anomalies);
        var n = Sorted(normal);
        var a = Sorted(anomalies);
        var thresholds = n.Concat(a).Distinct().Order().ToArray();
        var points = new List<RocPoint>(thresholds.Length + 1)
        {
            new(thresholds[0] - Math.Max(1, Math.Abs(thresholds[0])), 1, 1),
        };
        int ni = 0, ai = 0;
        foreach (var t in thresholds)
        {
            while (ni < n.Length && n[ni] <= t) ni++;
            while (ai < a.Length && a[ai] <= t) ai++;
            points.Add(new RocPoint(t, (n.Length - ni) / (double)n.Length, (a.Length - ai) / (double)a.Length));
        }
        return points;
    }

    private static double[] Sorted(IReadOnlyList<double> xs)
    {
        var s = xs.ToArray();
        Array.Sort(s);
        return s;
    }

    private static void Check(IReadOnlyList<double> normal, IReadOnlyList<double> anomalies)
    {
        if (normal.Count == 0 || anomalies.Count == 0)
            throw new EmitException("a ROC curve needs normal and anomalous vectors");
        if (normal.Any(x => !double.IsFinite(x)) || anomalies.Any(x => !double.IsFinite(x)))
            throw new EmitException("a free energy is not a finite number");
    }
}
