using System.Text.Json;
using System.Text.Json.Nodes;
using Emit.Model;

namespace Emit.Detection;

/// <summary>
/// The calibrated model: the threshold set (inside the model's identity hash, docs/model-format.md) and the
/// calibration recorded under <c>metadata.calibration</c> (outside it): data SHA-256, A, n, k, the interval.
/// Other metadata is kept; a metadata value that is not an object is kept under <c>metadata.original</c>.
/// </summary>
public static class CalibrationMetadata
{
    /// <summary>
    /// A copy of <paramref name="model"/> with the report's threshold and the calibration in its metadata.
    /// </summary>
    /// <param name="model">The model calibrated.</param>
    /// <param name="report">The calibration.</param>
    /// <param name="dataSha256">Lower-case hex SHA-256 of the normal data file's bytes.</param>
    /// <param name="dataName">The normal data file's name (no folder), or null.</param>
    public static BoltzmannModel Apply(BoltzmannModel model, CalibrationReport report, string dataSha256,
        string? dataName)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(report);
        JsonObject meta;
        var old = model.MetadataJson is null ? null : JsonNode.Parse(model.MetadataJson);
        if (old is JsonObject o) meta = o;
        else
        {
            meta = new JsonObject();
            if (old is not null) meta["original"] = old;
        }
        var c = new JsonObject
        {
            ["method"] = report.Method,
            ["threshold"] = report.Threshold,
        };
        if (report.FalseAlarm is { } a) c["false_alarm"] = a;
        if (report.Rank is { } k) c["rank"] = k;
        c["normal_vectors"] = report.NormalVectors;
        c["flagged"] = report.Flagged;
        c["false_alarm_interval"] = new JsonArray(report.FalseAlarmInterval.Low, report.FalseAlarmInterval.High);
        c["confidence"] = report.FalseAlarmInterval.Confidence;
        if (dataName is not null) c["data_file"] = dataName;
        c["data_sha256"] = dataSha256;
        if (report.Filter is { } f)
        {
            c["alarm_filter"] = f.Filter.ToString();
            if (f.SamplePeriodSeconds is { } p) c["sample_period_seconds"] = p;
            if (f.TargetPerDay is { } t) c["target_alarms_per_day"] = t;
        }
        c["caution"] = DetectionCaution.Text;
        meta.Remove("calibration");
        meta["calibration"] = c;
        var text = meta.ToJsonString(new JsonSerializerOptions
        {
            WriteIndented = true,
            Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
        }).Replace("\r\n", "\n").Replace("\n", "\n  ");
        return new BoltzmannModel(model.Kind, model.Visible, model.Hidden, model.VisibleBias, model.HiddenBias,
            model.Weights,
            model.VisibleLinks, model.HiddenLinks, model.Names, report.Threshold, model.LogPartition, text);
    }
}
