using System.Globalization;

namespace Emit.Detection;

/// <summary>The human-readable calibration report (docs/calibrate.md shows an example).</summary>
public static class CalibrationText
{
    /// <summary>What the interval of a filtered alarm rate rests on, and where it fails.</summary>
    public const string IndependenceNote =
        "the interval treats each row as an independent chance of raising an alarm; rows of a real log are " +
        "correlated " +
        "(faults and transients last several reports), so the true uncertainty is larger than stated";

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// Writes the calibration report <paramref name="r"/> of the data named in <paramref name="s"/> as text.
    /// </summary>
    public static void Write(TextWriter o, CalibrationReport r, CalibrationSource s)
    {
        ArgumentNullException.ThrowIfNull(o);
        ArgumentNullException.ThrowIfNull(r);
        ArgumentNullException.ThrowIfNull(s);
        o.WriteLine(
            $"emit calibrate {s.ModelName}: {r.NormalVectors} normal vectors from {s.NormalName} (reference scorer, " +
            "double precision)");
        if (r.Method == "conformal")
            o.WriteLine(
                "  method              conformal: the k-th smallest normal free energy, k = ceil((n+1)(1-A)) = " +
                $"{r.Rank} for A = {R(r.FalseAlarm!.Value)}");
        else
            o.WriteLine(
                $"  method              searched so that the {r.Filter!.Filter} filter raises at most " +
                $"{R(r.Filter.TargetPerDay!.Value)} alarms per day on the normal log");
        o.WriteLine($"  threshold           {R(r.Threshold)} (a vector is unusual when F(v) > threshold)");
        o.WriteLine($"  flagged             {r.Flagged} of {r.NormalVectors} normal vectors ({Pct(r.FalseAlarmRate)})");
        o.WriteLine(
            $"  false-alarm rate    {Pct(r.FalseAlarmRate)}, exact {Conf(r.FalseAlarmInterval)} interval " +
            $"[{Pct(r.FalseAlarmInterval.Low)}, {Pct(r.FalseAlarmInterval.High)}] (Clopper-Pearson)");
        if (r.Method == "conformal")
            o.WriteLine(
                "                      guarantee: a new normal vector exchangeable with these exceeds the threshold " +
                $"with probability <= A = {R(r.FalseAlarm!.Value)}");
        foreach (var w in r.Warnings) o.WriteLine("  warning: " + w);
        if (r.Anomalies is { } a)
        {
            o.WriteLine(
                $"  anomalies           {a.Detected} of {a.Vectors} vectors in {s.AnomaliesName} detected " +
                $"({Pct(a.DetectionRate)}, " +
                        $"exact {Conf(a.DetectionInterval)} interval [{Pct(a.DetectionInterval.Low)}, " +
                        $"{Pct(a.DetectionInterval.High)}])");
            o.WriteLine($"  ROC AUC             {a.RocAuc.ToString("0.0000", Inv)} (ties counted half)");
        }
        o.WriteLine("  conformal thresholds at standard rates:");
        o.WriteLine(r.Anomalies is null
            ? "      A        threshold          false alarms (this data)"
            : "      A        threshold          false alarms (this data)   detection");
        foreach (var row in r.RateTable)
        {
            var head = $"      {R(row.FalseAlarm),-8} ";
            if (row.Threshold is not { } t)
            {
                o.WriteLine(head + $"needs at least {row.MinimumVectors} normal vectors");
                continue;
            }
            var line = head + $"{R(t),-18} {Pct(row.FalseAlarmRate!.Value),-26}";
            if (row.DetectionRate is { } d) line += " " + Pct(d);
            o.WriteLine(line.TrimEnd());
        }
        if (r.Filter is { } f)
        {
            var run = f.Run;
            o.WriteLine($"  alarm filter {f.Filter} over {s.NormalName} as one time-ordered log of {run.Rows} rows:");
            o.WriteLine(
                $"                      {run.Unusual} unusual rows, the alarm raised {run.Raised} times, on at " +
                $"{run.RowsInAlarm} rows");
            o.WriteLine(
                $"                      {G(f.PerThousandRows)} alarms per 1000 rows, exact " +
                $"{Conf(f.PerThousandRowsInterval)} interval [{G(f.PerThousandRowsInterval.Low)}, " +
                $"{G(f.PerThousandRowsInterval.High)}]");
            if (f.PerDay is { } pd && f.PerDayInterval is { } pdi)
                o.WriteLine(
                    $"                      {G(pd)} alarms per day at one row every " +
                    $"{G(f.SamplePeriodSeconds!.Value)} s, exact {Conf(pdi)} interval [{G(pdi.Low)}, {G(pdi.High)}]");
            o.WriteLine("                      note: " + IndependenceNote);
        }
        if (r.Episodes is { } e)
        {
            o.WriteLine($"  anomaly episodes    {e.Raised} of {e.Names.Count} raised the alarm (filter {e.Filter})" +
                        (e.MeanReportsUntilRaised is { } m ? $"; mean reports until raised {G(m)}" : ""));
            for (int k = 0; k < e.Names.Count; k++)
                o.WriteLine($"      {e.Names[k]}: {e.Lengths[k]} reports, " +
                            (e.ReportsUntilRaised[k] is { } u ? $"raised at report {u}" : "never raised"));
        }
        o.WriteLine($"  calibrated model    sha256 {s.CalibratedSha256} (the threshold is part of the identity)");
        o.WriteLine("Caution: " + r.Caution);
    }

    private static string R(double x) => x.ToString("R", Inv);

    private static string G(double x) => x.ToString("0.####", Inv);

    private static string Pct(double x) => (100 * x).ToString(x >= 0.01 || x == 0 ? "0.##" : "G3", Inv) + " %";

    private static string Conf(RateInterval i) => (100 * i.Confidence).ToString("0.#", Inv) + "%";
}
