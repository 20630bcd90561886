using System.Text.Json;
using Emit.Detection;
using Emit.Model;

namespace Emit.Tests.Detection;

/// <summary>The calibration report and the calibrated model, on small hand-checked data.</summary>
public sealed class CalibratorTests
{
    [Fact]
    public void Conformal_report_counts_and_flags_as_defined()
    {
        // 199 normal values 1..199 (shuffled), A = 0.05: k = ceil(200 · 0.95) = 190, t = 190, 9 values above.
        var normal = Enumerable.Range(1, 199).Select(x => (double)x).OrderBy(x => (x * 37) % 199).ToArray();
        var anomalies = new double[] { 150, 195, 250, 300, 190 };
        var r = Calibrator.Run(new CalibrationRequest { Normal = normal, FalseAlarm = 0.05, Anomalies = anomalies });
        Assert.Equal("conformal", r.Method);
        Assert.Equal(190, r.Rank);
        Assert.Equal(190, r.Threshold);
        Assert.Equal(9, r.Flagged);
        Assert.Equal(9 / 199.0, r.FalseAlarmRate);
        Assert.Equal(ClopperPearson.Interval(9, 199), r.FalseAlarmInterval);
        Assert.Single(r.Warnings); // n·A = 9.95 < 10
        Assert.Equal(3, r.Anomalies!.Detected); // 195, 250, 300 (190 is not above 190)
        Assert.Equal(0.6, r.Anomalies.DetectionRate);
        Assert.Equal(Roc.Auc(normal, anomalies), r.Anomalies.RocAuc);
        // table: 0.1 (k = 180), 0.01 needs 99 -> allowed (k = 198), 0.001 needs 999 -> not
        Assert.Equal(180, r.RateTable[0].Threshold);
        Assert.Equal(198, r.RateTable[1].Threshold);
        Assert.Null(r.RateTable[2].Threshold);
        Assert.Equal(999, r.RateTable[2].MinimumVectors);
        Assert.Contains("not a safety function", r.Caution);
    }

    [Fact]
    public void Filter_and_episodes_are_reported_per_day_with_the_interval_scaled()
    {
        double[] log = [0, 5, 5, 0, 0, 0, 0, 5, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0];
        var r = Calibrator.Run(new CalibrationRequest
        {
            Normal = log,
            FalseAlarm = 0.2, // n = 20: k = ceil(21 · 0.8) = 17, t = 0
            Filter = AlarmFilterSpec.Parse("2/3"),
            SamplePeriodSeconds = 3600,
            Episodes = [[0, 5, 0, 5], [5, 0, 0, 0]],
        });
        Assert.Equal(0, r.Threshold);
        var f = r.Filter!;
        Assert.Equal(1, f.Run.Raised);
        Assert.Equal(1000.0 / 20, f.PerThousandRows, 12);
        Assert.Equal(24.0 / 20, f.PerDay!.Value, 12);
        var i = ClopperPearson.Interval(1, 20);
        Assert.Equal(i.High * 24, f.PerDayInterval!.Value.High, 12);
        Assert.Equal([4, null], r.Episodes!.ReportsUntilRaised);
        Assert.Equal(4, r.Episodes.MeanReportsUntilRaised);
    }

    [Fact]
    public void Target_search_and_a_rate_are_exclusive_and_the_target_needs_a_filter_and_period()
    {
        double[] log = [1, 2, 3];
        Assert.Throws<EmitException>(() => Calibrator.Run(new CalibrationRequest { Normal = log, FalseAlarm = 0.5, TargetAlarmsPerDay = 1, Filter = AlarmFilterSpec.None, SamplePeriodSeconds = 60 }));
        Assert.Throws<EmitException>(() => Calibrator.Run(new CalibrationRequest { Normal = log, TargetAlarmsPerDay = 1 }));
        Assert.Throws<EmitException>(() => Calibrator.Run(new CalibrationRequest { Normal = log }));
        var r = Calibrator.Run(new CalibrationRequest { Normal = log, TargetAlarmsPerDay = 0, Filter = AlarmFilterSpec.None, SamplePeriodSeconds = 60 });
        Assert.Equal(3, r.Threshold);
        Assert.Equal("target_alarms_per_day", r.Method);
    }

    // docs/model-format.md: the threshold is part of the identity, metadata is not.
    [Fact]
    public void Calibrated_model_has_the_threshold_in_its_identity_and_the_calibration_in_metadata()
    {
        var model = TestModels.Random(ModelKind.Rbm, 5, 3, 1);
        var withMeta = new BoltzmannModel(model.Kind, model.Visible, model.Hidden, model.VisibleBias, model.HiddenBias, model.Weights, metadataJson: "{\"trained_by\": \"x\"}");
        var r = Calibrator.Run(new CalibrationRequest { Normal = Enumerable.Range(0, 100).Select(x => x * 0.5).ToArray(), FalseAlarm = 0.1 });
        var calibrated = CalibrationMetadata.Apply(withMeta, r, new string('a', 64), "normal.csv");
        Assert.Equal(r.Threshold, calibrated.Threshold);
        Assert.Equal(model.With(r.Threshold, null).Sha256, calibrated.Sha256);
        Assert.NotEqual(model.Sha256, calibrated.Sha256);
        var reloaded = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(ModelJson.ToText(calibrated)), "m.json");
        Assert.Equal(calibrated.Sha256, reloaded.Sha256);
        using var meta = JsonDocument.Parse(reloaded.MetadataJson!);
        Assert.Equal("x", meta.RootElement.GetProperty("trained_by").GetString());
        var c = meta.RootElement.GetProperty("calibration");
        Assert.Equal(0.1, c.GetProperty("false_alarm").GetDouble());
        Assert.Equal(100, c.GetProperty("normal_vectors").GetInt32());
        Assert.Equal(new string('a', 64), c.GetProperty("data_sha256").GetString());
        Assert.Equal(r.FalseAlarmInterval.High, c.GetProperty("false_alarm_interval")[1].GetDouble());
        // recalibrating replaces the record instead of adding a second one
        var again = CalibrationMetadata.Apply(reloaded, r, new string('b', 64), null);
        using var meta2 = JsonDocument.Parse(again.MetadataJson!);
        Assert.Equal(new string('b', 64), meta2.RootElement.GetProperty("calibration").GetProperty("data_sha256").GetString());
    }
}
