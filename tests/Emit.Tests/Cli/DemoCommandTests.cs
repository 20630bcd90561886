using System.Globalization;
using System.Text.Json;
using System.Text.RegularExpressions;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Tests.Cli;

/// <summary>
/// <c>emit demo</c>: the facts of its summary checked against computations made here from the shipped files
/// (demo-data/) with the reference scorer, against scipy's Clopper–Pearson bounds, and against the files it wrote.
/// </summary>
public sealed class DemoCommandTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static string DemoDir()
    {
        var d = new DirectoryInfo(AppContext.BaseDirectory);
        while (!Directory.Exists(Path.Combine(d.FullName, "demo-data"))) d = d.Parent!;
        return Path.Combine(d.FullName, "demo-data");
    }

    private static List<double> Score(BoltzmannModel model, string path)
    {
        var scorer = new ReferenceScorer(model);
        using var reader = VectorReader.Open(path, model.Visible);
        var list = new List<double>();
        var row = new byte[model.Visible];
        while (reader.TryRead(row)) list.Add(scorer.FreeEnergy(row));
        return list;
    }

    private static string Row(string output, string item)
    {
        var m = Regex.Match(output, @"^  " + Regex.Escape(item) + @" +(.+)$", RegexOptions.Multiline);
        Assert.True(m.Success, $"no summary row \"{item}\" in:\n{output}");
        return m.Groups[1].Value;
    }

    [Fact]
    public void Demo_runs_the_whole_loop_and_its_summary_agrees_with_the_shipped_files()
    {
        var data = DemoDir();
        var outDir = Path.Combine(CliRunner.TempDir(), "demo");
        var r = CliRunner.Run("demo", "--out", outDir, "--data", data);
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        var o = r.Out;
        var shipped = ModelLoader.Load(Path.Combine(data, "reefer-fleet.json"));
        double threshold = shipped.Threshold!.Value;

        // train: the model made here is the shipped one (DemoData is deterministic); metadata lies outside the
        // identity hash and the threshold inside, so equal hashes mean equal weights, biases and threshold
        Assert.Contains("weights and biases equal to the shipped model's, bit for bit", o);
        Assert.Contains("threshold equal to the shipped model's", o);
        Assert.Equal(shipped.Sha256, ModelLoader.Load(Path.Combine(outDir, "reefer-fleet.json")).Sha256);
        Assert.Contains("normal.csv, faulty.csv and faults.csv are byte for byte those in", o);

        // false alarms: demo-data/normal.csv scored by the reference scorer against the shipped threshold
        int falseAlarms = Score(shipped, Path.Combine(data, "normal.csv")).Count(f => f > threshold);
        var fa = Regex.Match(Row(o, "false alarms on normal.csv"), @"^(\d+) of 2000 .*\[(\S+) %, (\S+) %\] \(Clopper–Pearson\)");
        Assert.True(fa.Success, o);
        Assert.Equal(falseAlarms, int.Parse(fa.Groups[1].Value, Inv));
        // 95 % Clopper–Pearson bounds for 20 of 2000 from scipy 1.10.1 (Debian python3-scipy):
        // beta.ppf(0.025, 20, 1981) = 0.006118657542743463, beta.ppf(0.975, 21, 1980) = 0.015402125783560048
        Assert.Equal(20, falseAlarms);
        Assert.Equal(0.6118657542743463, double.Parse(fa.Groups[2].Value, Inv), 0.005);
        Assert.Equal(1.5402125783560048, double.Parse(fa.Groups[3].Value, Inv), 0.005);

        // detection per fault: demo-data/faulty.csv scored here, grouped by demo-data/faults.csv
        var faulty = Score(shipped, Path.Combine(data, "faulty.csv"));
        var faults = File.ReadLines(Path.Combine(data, "faults.csv")).Skip(1).Select(l => l.Split(',')[1]).ToList();
        Assert.Equal(faulty.Count, faults.Count);
        foreach (var g in faults.Select((f, i) => (f, i)).GroupBy(x => x.f))
        {
            int detected = g.Count(x => faulty[x.i] > threshold);
            Assert.StartsWith($"{detected} of {g.Count()} ", Row(o, "detected: " + g.Key));
        }
        Assert.StartsWith($"{faulty.Count(f => f > threshold)} of {faulty.Count} ", Row(o, "detected: all faults"));

        // every scorer: the bound stated is the manifest's, every measured error lies within it, the footprint is the
        // header's; the verify report written beside says it passed
        foreach (var scorer in new[] { "f32", "fixed-int16" })
        {
            var folder = Path.Combine(outDir, scorer);
            using var manifest = JsonDocument.Parse(File.ReadAllText(Path.Combine(folder, "reefer_fleet.emit.json")));
            double bound = manifest.RootElement.GetProperty("scorer").GetProperty("error_bound").GetDouble();
            var b = Regex.Match(Row(o, $"scorer {scorer}: error bound"), @"^(\S+) nats stated; largest measured (.+)$");
            Assert.True(b.Success, o);
            Assert.Equal(bound, double.Parse(b.Groups[1].Value, Inv), bound * 1e-2);
            var measured = Regex.Matches(b.Groups[2].Value, @"(\S+) \((c|csharp|cortex-m3)\)");
            Assert.True(measured.Count >= 2, o);
            Assert.All(measured, m => Assert.InRange(double.Parse(m.Groups[1].Value, Inv), 0, bound));
            using var verify = JsonDocument.Parse(File.ReadAllText(Path.Combine(outDir, $"verify-{scorer}.json")));
            Assert.True(verify.RootElement.GetProperty("passed").GetBoolean());
            Assert.Equal(measured.Count, verify.RootElement.GetProperty("targets").GetArrayLength());

            var header = File.ReadAllText(Path.Combine(folder, "reefer_fleet.h"));
            string Macro(string n) => Regex.Match(header, @"#define REEFER_FLEET_" + n + @" (\d+)").Groups[1].Value;
            Assert.StartsWith($"{Macro("FLASH_BYTES")} bytes flash, {Macro("STACK_BYTES")} bytes stack predicted", Row(o, $"scorer {scorer}: footprint"));
        }
        bool m3 = Emit.Harness.Tool.Find("arm-none-eabi-gcc") is not null && Emit.Harness.Tool.Find("qemu-system-arm") is not null;
        if (m3) Assert.Contains("(cortex-m3)", Row(o, "scorer f32: error bound"));
        else Assert.Contains("the emulated Cortex-M3 is not run:", o);

        // explain: every ΔF written is F(v with the unit flipped) − F(v) by the reference scorer (brute force)
        var rows = File.ReadAllLines(Path.Combine(data, "faulty.csv")).Skip(1)
            .Select(l => l.Split(',').Select(x => (byte)(x == "1" ? 1 : 0)).ToArray()).ToList();
        var reference = new ReferenceScorer(shipped);
        var explained = File.ReadAllLines(Path.Combine(outDir, "explain.csv"));
        Assert.Equal("index,rank,unit,name,delta_free_energy", explained[0]);
        Assert.Equal(7, explained.Length);
        foreach (var line in explained.Skip(1))
        {
            var f = line.Split(',');
            var v = rows[int.Parse(f[0], Inv)];
            int unit = int.Parse(f[2], Inv);
            Assert.Equal(shipped.Names[unit], f[3]);
            var flipped = (byte[])v.Clone();
            flipped[unit] ^= 1;
            Assert.Equal(reference.FreeEnergy(flipped) - reference.FreeEnergy(v), double.Parse(f[4], Inv), 1e-9);
        }

        // every file the summary lists is there, and nothing else was left beside them (but AtomicFile's record of
        // the files emit wrote in each folder, .emit-written, src/Emit/WrittenLedger.cs)
        var listed = Regex.Matches(o, @"^  file: [^\n]*?  +(.+)$", RegexOptions.Multiline)
            .SelectMany(m => m.Groups[1].Value.Split(", ")).Select(p => p.Trim()).ToList();
        Assert.Contains("calibration.png", listed);
        Assert.Contains("data/training.csv", listed);
        var onDisk = Directory.GetFiles(outDir, "*", SearchOption.AllDirectories).Where(p => Path.GetFileName(p) != ".emit-written").Select(p => Path.GetRelativePath(outDir, p).Replace('\\', '/')).Order().ToList();
        Assert.Equal(listed.Order().ToList(), onDisk);

        Assert.Contains("monitoring aid, not a safety function", o);
    }

    [Fact]
    public void Demo_without_out_deletes_its_temporary_files()
    {
        var r = CliRunner.Run("demo", "--data", DemoDir());
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        var m = Regex.Match(r.Out, @"files go to a temporary folder, (\S+), deleted at the end");
        Assert.True(m.Success, r.Out);
        Assert.False(Directory.Exists(m.Groups[1].Value));
        Assert.Contains("the temporary files were deleted", r.Out);
    }

    [Fact]
    public void Demo_with_a_data_folder_without_the_model_says_so()
    {
        var r = CliRunner.Run("demo", "--data", CliRunner.TempDir());
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("reefer-fleet.json", r.Error);
    }
}
