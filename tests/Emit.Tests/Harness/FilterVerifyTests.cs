using System.Runtime.CompilerServices;
using Emit.Detection;
using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Tests.Cli;

namespace Emit.Tests.Harness;

/// <summary>
/// emit verify with the alarm filter on the three targets: every input's decision goes through the generated filter
/// in input order, across batches and Cortex-M3 images, and each output is checked against Detection's K-of-N
/// filter of the same decisions (<see cref="FilterCheck"/>); the reports carry the feature.
/// </summary>
public sealed class FilterVerifyTests
{
    private static string Demo(string file, [CallerFilePath] string here = "") =>
        Path.GetFullPath(Path.Combine(Path.GetDirectoryName(here)!, "..", "..", "..", "demo-data", file));

    [SkippableTheory]
    [InlineData(NumericMode.F32)]
    [InlineData(NumericMode.Fixed)]
    public void The_filter_passes_on_every_target_across_batches_and_images(NumericMode mode)
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var model = ModelLoader.Load(Demo("reefer-fleet.json"));
        var report = Verifier.Run(new VerifyRequest
        {
            Model = model,
            ModelLabel = "reefer-fleet.json",
            InputPath = Demo("faulty.csv"),
            Targets = ["c", "csharp", "cortex-m3"],
            Numeric = mode,
            AlarmFilter = new AlarmFilterSpec(3, 5),
            Settings = VerifyCases.Settings(imageInputs: 150),
            BatchRows = 64,
        });
        Assert.True(report.Passed, VerifyCases.Describe(report));
        // the reference decisions through Detection's filter: how often the alarm is on over the log
        var energies = new List<double>();
        var scorer = new Emit.Reference.ReferenceScorer(model);
        using (var reader = Emit.Vectors.VectorReader.Open(Demo("faulty.csv"), model.Visible))
        {
            var units = new byte[model.Visible];
            while (reader.ReadBatch(units, 1) == 1) energies.Add(scorer.FreeEnergy(units));
        }
        var run = AlarmFilter.Run(energies, model.Threshold!.Value, new AlarmFilterSpec(3, 5));
        Assert.True(run.RowsInAlarm > 0 && run.RowsInAlarm < run.Rows, "the log must switch the filter on and off");
        foreach (var t in report.Targets)
        {
            var f = Assert.Single(t.Features);
            Assert.Equal("filter", f.Feature);
            Assert.Equal(energies.Count, f.Checks);
            Assert.Equal(0, f.Mismatches);
        }
    }

    [SkippableFact]
    public void Verify_generated_takes_the_filter_from_the_manifest_and_reports_it()
    {
        VerifyCases.Require("c");
        var dir = CliRunner.TempDir();
        var src = Path.Combine(dir, "src");
        var r = CliRunner.Run("compile", Demo("reefer-fleet.json"), "--numeric", "fixed", "--alarm-filter", "2/4",
            "--name", "reefer", "--out", src);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains("\"alarm_filter\": \"2/4\"", File.ReadAllText(Path.Combine(src, "reefer.emit.json")));
        var json = Path.Combine(dir, "report.json");
        r = CliRunner.Run("verify", Demo("reefer-fleet.json"), "-i", Demo("faulty.csv"), "--generated", src,
            "--report", json);
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        Assert.Contains("c filter: 400 checked, 0 mismatches", r.Out);
        using var doc = System.Text.Json.JsonDocument.Parse(File.ReadAllText(json));
        var feature = doc.RootElement.GetProperty("targets")[0].GetProperty("features")[0];
        Assert.Equal("filter", feature.GetProperty("feature").GetString());
        Assert.Equal(400, feature.GetProperty("checks").GetInt64());

        // asking for another filter than the sources have is a usage error, one line
        r = CliRunner.Run("verify", Demo("reefer-fleet.json"), "-i", Demo("faulty.csv"), "--generated", src,
            "--alarm-filter", "3/5");
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("with the alarm filter 2/4, not 3/5", r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
    }
}
