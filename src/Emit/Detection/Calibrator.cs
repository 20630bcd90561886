using Emit.Model;

namespace Emit.Detection;

/// <summary>
/// Sets a threshold from normal free energies and reports how good it is (docs/calibrate.md).
/// <list type="bullet">
/// <item>Conformal (a false-alarm rate A): t is the k-th smallest normal free energy, k = ⌈(n + 1)(1 − A)⌉
/// (<see cref="ConformalThreshold"/>).</item>
/// <item>Target alarms per day (a K-of-N filter, a sample period and a target): t is searched on the normal log
/// (<see cref="AlarmRateSearch"/>).</item>
/// </list>
/// Every rate comes with its exact (Clopper–Pearson) interval. For the filter, the raised alarms are counted as
/// successes among the log's rows, i.e. the interval treats each row as an independent chance of raising an alarm.
/// Consecutive rows of a real log are correlated (a fault or a transient lasts several reports) and a raised alarm
/// holds the filter on for a while, so the effective number of independent trials is smaller than the rows and the
/// true interval is wider than the one stated; it is a lower bound on the uncertainty, not a guarantee.
/// </summary>
public static class Calibrator
{
    /// <summary>The false-alarm rates of the rate table.</summary>
    public static readonly IReadOnlyList<double> TableRates = [0.1, 0.01, 0.001];

    /// <summary>
    /// Below this many expected false alarms in the calibration set (n·A) the threshold is flagged as resting on few
    /// values.
    /// </summary>
    public const double FewExpectedAlarms = 10;

    /// <summary>
    /// Calibrates <paramref name="model"/> (file name <paramref name="modelName"/>) on free energies it gave, and
    /// builds the calibrated model and the report's sources: the one call a program needs.
    /// </summary>
    public static CalibrationOutcome Calibrate(BoltzmannModel model, string modelName, CalibrationRequest request,
        string normalName, string normalSha256, string? anomaliesName = null)
    {
        ArgumentNullException.ThrowIfNull(model);
        var report = Run(request);
        var calibrated = CalibrationMetadata.Apply(model, report, normalSha256, normalName);
        return new CalibrationOutcome(report, calibrated,
            new CalibrationSource(modelName, calibrated.Sha256, normalName, normalSha256, anomaliesName));
    }

    /// <summary>Calibrates and reports.</summary>
    public static CalibrationReport Run(CalibrationRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        var normal = request.Normal;
        if (normal.Count == 0) throw new EmitException("the normal data has no vectors");
        CheckFinite(normal, "normal");
        if (request.Anomalies is { Count: 0 }) throw new EmitException("the anomaly data has no vectors");
        if (request.Anomalies is not null) CheckFinite(request.Anomalies, "anomaly");
        var sorted = normal.ToArray();
        Array.Sort(sorted);
        var warnings = new List<string>();
        // A sample period alone still gives alarms per day: those of the unfiltered decisions (1/1).
        var spec = request.Filter ?? (request.SamplePeriodSeconds is not null ? AlarmFilterSpec.None : null);

        double threshold;
        long? rank = null;
        FilterResult? filter = null;
        string method;
        if (request.TargetAlarmsPerDay is { } target)
        {
            if (request.FalseAlarm is not null)
                throw new EmitException("both a false-alarm rate and a target of alarms per day were given",
                    "give one: the threshold comes from either");
            if (request.Filter is null || request.SamplePeriodSeconds is null)
                throw new EmitException("a target of alarms per day needs an alarm filter and a sample period",
                    "give both, e.g. an alarm filter 3/5 and a sample period 5m");
            var (t, run) = AlarmRateSearch.ForTarget(normal, request.Filter, request.SamplePeriodSeconds.Value, target);
            threshold = t;
            method = "target_alarms_per_day";
            filter = Filtered(request, request.Filter, run, target);
        }
        else
        {
            double a = request.FalseAlarm
                ?? throw new EmitException("no false-alarm rate was given",
                    "give the rate of false alarms to allow, e.g. 0.01");
            rank = ConformalThreshold.Rank(normal.Count, a);
            threshold = sorted[rank.Value - 1];
            method = "conformal";
            if (normal.Count * a < FewExpectedAlarms)
                warnings.Add(
                    $"n·A = {normal.Count} × {ConformalThreshold.Text(a)} = " +
                    $"{(normal.Count * a).ToString("0.##", System.Globalization.CultureInfo.InvariantCulture)} < " +
                    $"{FewExpectedAlarms}: " +
                             "the threshold rests on the few largest normal free energies and moves a lot from one " +
                             "calibration set to another; give more normal data");
            if (spec is not null)
                filter = Filtered(request, spec, AlarmFilter.Run(normal, threshold, spec), null);
        }
        long flagged = normal.Count - UpperBound(sorted, threshold);

        AnomalyResult? anomalies = null;
        if (request.Anomalies is { } an)
        {
            long detected = an.Count(f => f > threshold);
            anomalies = new AnomalyResult(an.Count, detected, detected / (double)an.Count,
                ClopperPearson.Interval(detected, an.Count, request.Confidence), Roc.Auc(normal, an));
        }

        var table = TableRates.Select(a =>
        {
            long min = ConformalThreshold.MinimumVectors(a);
            if (normal.Count < min) return new RateTableRow(a, min, null, null, null);
            double t = ConformalThreshold.ThresholdOfSorted(sorted, a);
            double fa = (normal.Count - UpperBound(sorted, t)) / (double)normal.Count;
            double? dr = request.Anomalies is { } x ? x.Count(f => f > t) / (double)x.Count : null;
            return new RateTableRow(a, min, t, fa, dr);
        }).ToList();

        EpisodeResult? episodes = null;
        if (request.Episodes is { } eps)
        {
            if (eps.Count == 0) throw new EmitException("no anomaly episodes were given");
            var f = request.Filter ?? AlarmFilterSpec.None;
            var names = request.EpisodeNames ?? eps.Select((_, i) => "episode " + (i + 1)).ToList();
            var until = eps.Select(e => AlarmFilter.ReportsUntilRaised(e, threshold, f)).ToList();
            var raised = until.Where(u => u is not null).Select(u => (double)u!.Value).ToList();
            episodes = new EpisodeResult(f, names, eps.Select(e => e.Count).ToList(), until,
                raised.Count > 0 ? raised.Average() : null);
        }

        return new CalibrationReport
        {
            Threshold = threshold,
            Method = method,
            FalseAlarm = request.FalseAlarm,
            Rank = rank,
            NormalVectors = normal.Count,
            Flagged = flagged,
            FalseAlarmInterval = ClopperPearson.Interval(flagged, normal.Count, request.Confidence),
            Warnings = warnings,
            Anomalies = anomalies,
            RateTable = table,
            Filter = filter,
            Episodes = episodes,
            NormalEnergies = normal,
            AnomalyEnergies = request.Anomalies,
        };
    }

    private static FilterResult Filtered(CalibrationRequest request, AlarmFilterSpec spec, AlarmFilterRun run,
        double? target)
    {
        var perRow = ClopperPearson.Interval(run.Raised, run.Rows, request.Confidence);
        double rate = run.Raised / (double)run.Rows;
        double? perDay = null;
        RateInterval? perDayInterval = null;
        if (request.SamplePeriodSeconds is { } p)
        {
            double rowsPerDay = SamplePeriod.RowsPerDay(p);
            perDay = rate * rowsPerDay;
            perDayInterval = perRow.Scale(rowsPerDay);
        }
        return new FilterResult(spec, run, rate * 1000, perRow.Scale(1000), request.SamplePeriodSeconds, perDay,
            perDayInterval, target);
    }

    /// <summary>The number of values ≤ x in an ascending array.</summary>
    private static long UpperBound(double[] sorted, double x)
    {
        int lo = 0, hi = sorted.Length;
        while (lo < hi)
        {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] <= x) lo = mid + 1; else hi = mid;
        }
        return lo;
    }

    private static void CheckFinite(IReadOnlyList<double> xs, string what)
    {
        for (int k = 0; k < xs.Count; k++)
            if (!double.IsFinite(xs[k]))
                throw new EmitException($"the free energy of {what} vector {k} is not a finite number");
    }
}
