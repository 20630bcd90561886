using System.Text.Json;

namespace Emit.Detection;

/// <summary>The calibration as one JSON object (field list in docs/calibrate.md).</summary>
public static class CalibrationJson
{
    /// <summary>
    /// Writes the calibration report <paramref name="r"/> of the data named in <paramref name="s"/> as JSON.
    /// </summary>
    public static void Write(Utf8JsonWriter w, CalibrationReport r, CalibrationSource s)
    {
        ArgumentNullException.ThrowIfNull(w);
        ArgumentNullException.ThrowIfNull(r);
        ArgumentNullException.ThrowIfNull(s);
        w.WriteStartObject();
        w.WriteString("caution", r.Caution);
        w.WriteString("model", s.ModelName);
        w.WriteString("calibrated_sha256", s.CalibratedSha256);
        w.WriteString("normal_data", s.NormalName);
        w.WriteString("normal_data_sha256", s.NormalSha256);
        w.WriteString("method", r.Method);
        w.WriteNumber("threshold", r.Threshold);
        if (r.FalseAlarm is { } a) w.WriteNumber("false_alarm", a); else w.WriteNull("false_alarm");
        if (r.Rank is { } k) w.WriteNumber("rank", k); else w.WriteNull("rank");
        w.WriteNumber("normal_vectors", r.NormalVectors);
        w.WriteNumber("flagged", r.Flagged);
        w.WriteNumber("false_alarm_rate", r.FalseAlarmRate);
        Interval(w, "false_alarm_interval", r.FalseAlarmInterval);
        w.WriteNumber("confidence", r.FalseAlarmInterval.Confidence);
        w.WriteStartArray("warnings");
        foreach (var x in r.Warnings) w.WriteStringValue(x);
        w.WriteEndArray();
        if (r.Anomalies is { } an)
        {
            w.WriteString("anomaly_data", s.AnomaliesName);
            w.WriteNumber("anomaly_vectors", an.Vectors);
            w.WriteNumber("detected", an.Detected);
            w.WriteNumber("detection_rate", an.DetectionRate);
            Interval(w, "detection_interval", an.DetectionInterval);
            w.WriteNumber("roc_auc", an.RocAuc);
        }
        w.WriteStartArray("rate_table");
        foreach (var row in r.RateTable)
        {
            w.WriteStartObject();
            w.WriteNumber("false_alarm", row.FalseAlarm);
            w.WriteNumber("minimum_vectors", row.MinimumVectors);
            Nullable(w, "threshold", row.Threshold);
            Nullable(w, "false_alarm_rate", row.FalseAlarmRate);
            Nullable(w, "detection_rate", row.DetectionRate);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        if (r.Filter is { } f)
        {
            w.WriteStartObject("alarm_filter");
            w.WriteString("filter", f.Filter.ToString());
            w.WriteNumber("k", f.Filter.K);
            w.WriteNumber("n", f.Filter.N);
            w.WriteNumber("rows", f.Run.Rows);
            w.WriteNumber("unusual_rows", f.Run.Unusual);
            w.WriteNumber("raised", f.Run.Raised);
            w.WriteNumber("rows_in_alarm", f.Run.RowsInAlarm);
            w.WriteNumber("alarms_per_1000_rows", f.PerThousandRows);
            Interval(w, "alarms_per_1000_rows_interval", f.PerThousandRowsInterval);
            Nullable(w, "sample_period_seconds", f.SamplePeriodSeconds);
            Nullable(w, "alarms_per_day", f.PerDay);
            if (f.PerDayInterval is { } pdi)
                Interval(w, "alarms_per_day_interval", pdi); else w.WriteNull("alarms_per_day_interval");
            Nullable(w, "target_alarms_per_day", f.TargetPerDay);
            w.WriteString("assumption", CalibrationText.IndependenceNote);
            w.WriteEndObject();
        }
        if (r.Episodes is { } e)
        {
            w.WriteStartObject("episodes");
            w.WriteString("filter", e.Filter.ToString());
            w.WriteNumber("count", e.Names.Count);
            w.WriteNumber("raised", e.Raised);
            Nullable(w, "mean_reports_until_raised", e.MeanReportsUntilRaised);
            w.WriteStartArray("episodes");
            for (int i = 0; i < e.Names.Count; i++)
            {
                w.WriteStartObject();
                w.WriteString("name", e.Names[i]);
                w.WriteNumber("reports", e.Lengths[i]);
                if (e.ReportsUntilRaised[i] is { } u)
                    w.WriteNumber("reports_until_raised", u); else w.WriteNull("reports_until_raised");
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteEndObject();
        }
        w.WriteEndObject();
    }

    private static void Interval(Utf8JsonWriter w, string name, RateInterval i)
    {
        w.WriteStartArray(name);
        w.WriteNumberValue(i.Low);
        w.WriteNumberValue(i.High);
        w.WriteEndArray();
    }

    private static void Nullable(Utf8JsonWriter w, string name, double? x)
    {
        if (x is { } v) w.WriteNumber(name, v); else w.WriteNull(name);
    }
}
