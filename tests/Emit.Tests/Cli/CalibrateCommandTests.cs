using System.Security.Cryptography;
using System.Text.Json;
using Emit.Detection;
using Emit.Model;
using Emit.Tests.Reference;
using Json.Schema;

namespace Emit.Tests.Cli;

/// <summary>
/// <c>emit calibrate</c> end to end on a small model whose free energies the tests compute by brute-force enumeration
/// (<see cref="BruteForce"/>), so the threshold is checked as the k-th smallest of values emit did not compute.
/// </summary>
public sealed class CalibrateCommandTests
{
    private sealed record Setup(string Dir, string Model, BoltzmannModel M, string Normal, double[] NormalF, string Anomalies, double[] AnomalyF);

    private static Setup Make(int normalRows = 300)
    {
        var m = TestModels.Random(ModelKind.Lateral, 6, 3, 21, scale: 1.0);
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var rng = new Random(3);
        var normal = Enumerable.Range(0, normalRows).Select(_ => TestModels.RandomUnits(6, rng, 0.3)).ToList();
        var anomalies = Enumerable.Range(0, 60).Select(_ => TestModels.RandomUnits(6, rng, 0.7)).ToList();
        string Write(string name, List<byte[]> rows)
        {
            var p = Path.Combine(dir, name);
            File.WriteAllLines(p, rows.Select(r => string.Join(",", r)));
            return p;
        }
        return new Setup(dir, model, m, Write("normal.csv", normal), normal.Select(v => BruteForce.FreeEnergy(m, v)).ToArray(),
            Write("faulty.csv", anomalies), anomalies.Select(v => BruteForce.FreeEnergy(m, v)).ToArray());
    }

    // the JSON schema (docs/calibrate-report.schema.json), checked with an outside validator (JsonSchema.Net)
    private static readonly Lazy<JsonSchema> Schema = new(() =>
    {
        var dir = AppContext.BaseDirectory;
        while (!File.Exists(Path.Combine(dir, "docs", "calibrate-report.schema.json"))) dir = Path.GetDirectoryName(dir)!;
        return JsonSchema.FromText(File.ReadAllText(Path.Combine(dir, "docs", "calibrate-report.schema.json")));
    });

    private static JsonDocument Parse(string json)
    {
        var doc = JsonDocument.Parse(json);
        var result = Schema.Value.Evaluate(doc.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(result.IsValid, "report does not match docs/calibrate-report.schema.json: " +
            string.Join("; ", (result.Details ?? []).Where(d => d.Errors is not null).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}"))));
        return doc;
    }

    [Fact]
    public void Schema_rejects_a_report_missing_the_threshold()
    {
        var s = Make();
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.05", "--json");
        var broken = r.Out.Replace("\"threshold\":", "\"threshold_x\":");
        var result = Schema.Value.Evaluate(JsonDocument.Parse(broken).RootElement);
        Assert.False(result.IsValid);
    }

    [Fact]
    public void Json_report_has_the_kth_smallest_free_energy_and_its_counts()
    {
        var s = Make();
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.05", "--anomalies", s.Anomalies, "--json");
        Assert.Equal(0, r.ExitCode);
        using var doc = Parse(r.Out);
        var j = doc.RootElement;
        // k = ceil(301 * 0.95) = 286
        var sorted = s.NormalF.Order().ToArray();
        double expected = sorted[286 - 1];
        Assert.Equal(expected, j.GetProperty("threshold").GetDouble(), 10);
        Assert.Equal(286, j.GetProperty("rank").GetInt32());
        Assert.Equal(300, j.GetProperty("normal_vectors").GetInt32());
        // Only 64 states exist, so many vectors tie with the threshold; the brute-force values and emit's agree to
        // about 1e-15, not bit for bit, so a value within 1e-12 of the threshold counts as equal to it (not flagged).
        double t = j.GetProperty("threshold").GetDouble();
        bool Above(double f) => f > t + 1e-12 * Math.Max(1, Math.Abs(t));
        int flagged = s.NormalF.Count(Above);
        Assert.Equal(flagged, j.GetProperty("flagged").GetInt32());
        Assert.Equal(flagged / 300.0, j.GetProperty("false_alarm_rate").GetDouble(), 12);
        var interval = j.GetProperty("false_alarm_interval");
        Assert.Equal(2, interval.GetArrayLength());
        Assert.True(interval[0].GetDouble() <= flagged / 300.0 && flagged / 300.0 <= interval[1].GetDouble());
        Assert.Equal(s.AnomalyF.Count(Above) / 60.0, j.GetProperty("detection_rate").GetDouble(), 12);
        Assert.InRange(j.GetProperty("roc_auc").GetDouble(), 0, 1);
        Assert.Contains("not a safety function", j.GetProperty("caution").GetString());
        Assert.Equal(3, j.GetProperty("rate_table").GetArrayLength());
    }

    [Fact]
    public void Text_report_carries_the_threshold_interval_and_caution()
    {
        var s = Make();
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.05");
        Assert.Equal(0, r.ExitCode);
        Assert.Contains("threshold", r.Out);
        Assert.Contains("Clopper-Pearson", r.Out);
        Assert.DoesNotContain("warning:", r.Out); // n·A = 15 >= 10
        Assert.Contains("Caution: a monitoring aid, not a safety function", r.Out);
    }

    [Fact]
    public void Few_expected_false_alarms_warn_and_too_few_vectors_are_refused_with_the_number_needed()
    {
        var s = Make(120);
        var warn = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.05");
        Assert.Equal(0, warn.ExitCode);
        Assert.Contains("warning: n·A = 120 × 0.05 = 6 < 10", warn.Out);
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.001");
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("needs at least 999 normal vectors", r.Error);
        Assert.Single(r.Error.Trim().Split('\n'));
    }

    [Fact]
    public void Output_model_has_the_threshold_and_the_calibration_record_and_respects_no_clobber()
    {
        var s = Make();
        var outPath = Path.Combine(s.Dir, "calibrated.json");
        var report = Path.Combine(s.Dir, "report.json");
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "-o", outPath, "--report", report);
        Assert.Equal(0, r.ExitCode);
        var m = ModelLoader.Load(outPath);
        double t = s.NormalF.Order().ElementAt(271 - 1); // k = ceil(301 * 0.9) = 271
        Assert.Equal(t, m.Threshold!.Value, 10);
        Assert.Equal(s.M.With(m.Threshold, null).Sha256, m.Sha256);
        using var meta = JsonDocument.Parse(m.MetadataJson!);
        var c = meta.RootElement.GetProperty("calibration");
        var sha = Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(s.Normal)));
        Assert.Equal(sha, c.GetProperty("data_sha256").GetString());
        Assert.Equal(0.1, c.GetProperty("false_alarm").GetDouble());
        Assert.Equal(300, c.GetProperty("normal_vectors").GetInt32());
        Assert.Equal(2, c.GetProperty("false_alarm_interval").GetArrayLength());
        using var rep = Parse(File.ReadAllText(report));
        Assert.Equal(m.Sha256, rep.RootElement.GetProperty("calibrated_sha256").GetString());
        Assert.Contains("sha256 " + m.Sha256, r.Out);
        // emit wrote it: a rerun may replace it; a file emit did not write is refused without --force
        Assert.Equal(0, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "-o", outPath).ExitCode);
        var foreign = Path.Combine(s.Dir, "foreign.json");
        File.WriteAllText(foreign, "{}");
        var refused = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "-o", foreign);
        Assert.Equal(2, refused.ExitCode);
        Assert.Equal("{}", File.ReadAllText(foreign));
        Assert.Equal(0, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "-o", foreign, "--force").ExitCode);
    }

    [Fact]
    public void Output_dash_writes_the_model_to_standard_output_and_refuses_json_beside_it()
    {
        var s = Make();
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "-o", "-");
        Assert.Equal(0, r.ExitCode);
        var m = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(r.Out), "stdout");
        Assert.Equal(s.NormalF.Order().ElementAt(271 - 1), m.Threshold!.Value, 10);
        Assert.Equal(2, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "-o", "-", "--json").ExitCode);
    }

    [Fact]
    public void Standard_input_is_hashed_like_the_file()
    {
        var s = Make();
        var outPath = Path.Combine(s.Dir, "c.json");
        var r = CliRunner.RunWithInput(File.ReadAllText(s.Normal), "calibrate", s.Model, "--normal", "-", "--false-alarm", "0.1", "-o", outPath);
        Assert.Equal(0, r.ExitCode);
        using var meta = JsonDocument.Parse(ModelLoader.Load(outPath).MetadataJson!);
        Assert.Equal(Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(s.Normal))),
            meta.RootElement.GetProperty("calibration").GetProperty("data_sha256").GetString());
    }

    [Theory]
    [InlineData("plot.png")]
    [InlineData("plot.svg")]
    public void Plot_is_written_by_extension(string name)
    {
        var s = Make();
        var path = Path.Combine(s.Dir, name);
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "--anomalies", s.Anomalies, "--plot", path, "--json");
        Assert.Equal(0, r.ExitCode);
        JsonDocument.Parse(r.Out).Dispose(); // standard output stays pure JSON
        var bytes = File.ReadAllBytes(path);
        if (name.EndsWith(".png", StringComparison.Ordinal))
            Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47 }, bytes[..4]); // PNG signature (ISO/IEC 15948)
        else
        {
            var text = System.Text.Encoding.UTF8.GetString(bytes);
            Assert.Contains("<svg", text);
            Assert.Contains("ROC", text);
            Assert.Contains("Caution", text);
        }
        var bad = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "--plot", Path.Combine(s.Dir, "plot.gif"));
        Assert.Equal(2, bad.ExitCode);
    }

    [Fact]
    public void Alarm_filter_reports_per_1000_rows_and_per_day_and_episodes_until_raised()
    {
        var s = Make();
        var ep1 = Path.Combine(s.Dir, "episode-1.csv");
        var ep2 = Path.Combine(s.Dir, "episode-2.csv");
        // the most and least unusual of all 64 vectors, by brute force
        var all = Enumerable.Range(0, 64).Select(b => TestModels.Bits(b, 6)).ToArray();
        var on = all.MaxBy(v => BruteForce.FreeEnergy(s.M, v))!;
        var off = all.MinBy(v => BruteForce.FreeEnergy(s.M, v))!;
        string L(byte[] v) => string.Join(",", v);
        // normal data without the most unusual vector, so that it lies above any threshold set on them
        var normalRows = File.ReadAllLines(s.Normal).Where(l => l != L(on)).ToArray();
        var normalF = s.NormalF.Where((_, k) => File.ReadAllLines(s.Normal)[k] != L(on)).ToArray();
        var normalPath = Path.Combine(s.Dir, "normal-2.csv");
        File.WriteAllLines(normalPath, normalRows);
        File.WriteAllLines(ep1, [L(on), L(on), L(on)]);
        File.WriteAllLines(ep2, [L(off), L(on), L(off), L(on), L(on)]);
        var r = CliRunner.Run("calibrate", s.Model, "--normal", normalPath, "--false-alarm", "0.1", "--alarm-filter", "2/3",
            "--sample-period", "5m", "--episodes", ep1, ep2, "--json");
        Assert.Equal(0, r.ExitCode);
        using var doc = Parse(r.Out);
        var j = doc.RootElement;
        double t = j.GetProperty("threshold").GetDouble();
        var f = j.GetProperty("alarm_filter");
        var expected = AlarmFilter.Run(normalF, t, AlarmFilterSpec.Parse("2/3"));
        int n = normalF.Length;
        Assert.Equal(n, f.GetProperty("rows").GetInt32());
        Assert.Equal(expected.Raised, f.GetProperty("raised").GetInt64());
        Assert.Equal(expected.Raised * 1000.0 / n, f.GetProperty("alarms_per_1000_rows").GetDouble(), 9);
        Assert.Equal(expected.Raised * 288.0 / n, f.GetProperty("alarms_per_day").GetDouble(), 9); // 288 rows a day at 5 min
        Assert.Contains("independent", f.GetProperty("assumption").GetString());
        var e = j.GetProperty("episodes");
        Assert.Equal(2, e.GetProperty("count").GetInt32());
        // naive 2-of-3 on the brute-force free energies of each episode: the first report where 2 of the last 3 exceed t
        int? Until(byte[][] rows)
        {
            var u = rows.Select(v => BruteForce.FreeEnergy(s.M, v) > t).ToArray();
            for (int k = 0; k < u.Length; k++)
                if (Enumerable.Range(Math.Max(0, k - 2), Math.Min(3, k + 1)).Count(i => u[i]) >= 2) return k + 1;
            return null;
        }
        var expectedUntil = new[] { Until([on, on, on]), Until([off, on, off, on, on]) };
        Assert.Contains(expectedUntil, x => x is not null); // the case is not vacuous
        for (int k = 0; k < 2; k++)
        {
            var got = e.GetProperty("episodes")[k].GetProperty("reports_until_raised");
            Assert.Equal(expectedUntil[k], got.ValueKind == JsonValueKind.Null ? null : got.GetInt32());
        }
        Assert.Equal("episode-1.csv", e.GetProperty("episodes")[0].GetProperty("name").GetString());
    }

    [Fact]
    public void Target_alarms_per_day_sets_a_threshold_meeting_it()
    {
        var s = Make();
        var r = CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--alarm-filter", "1/1", "--sample-period", "1h", "--target-alarms-per-day", "1", "--json");
        Assert.Equal(0, r.ExitCode);
        using var doc = Parse(r.Out);
        var f = doc.RootElement.GetProperty("alarm_filter");
        Assert.True(f.GetProperty("alarms_per_day").GetDouble() <= 1);
        Assert.Equal("target_alarms_per_day", doc.RootElement.GetProperty("method").GetString());
        Assert.Equal(2, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--target-alarms-per-day", "1").ExitCode);
        Assert.Equal(2, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal).ExitCode);
        Assert.Equal(2, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "--alarm-filter", "4/3").ExitCode);
        Assert.Equal(2, CliRunner.Run("calibrate", s.Model, "--normal", s.Normal, "--false-alarm", "0.1", "--sample-period", "5 min").ExitCode);
    }
}
