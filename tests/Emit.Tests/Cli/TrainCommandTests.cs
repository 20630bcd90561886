using System.Diagnostics;
using System.Security.Cryptography;
using System.Text.Json;
using Emit.Model;
using Emit.Tests.Emission;

namespace Emit.Tests.Cli;

public sealed class TrainCommandTests
{
    /// <summary>Two invented prototypes over 6 flags, each bit flipped with probability 0.1; unit "f" is always 0.</summary>
    private static string Csv(int rows, int seed, bool header = true)
    {
        var rng = new Random(seed);
        var sb = new System.Text.StringBuilder(header ? "a,b,c,d,e,f\n" : "");
        for (int r = 0; r < rows; r++)
        {
            bool first = rng.NextDouble() < 0.5;
            var v = Enumerable.Range(0, 6).Select(i => i == 5 ? 0 : ((i < 3) == first) ^ (rng.NextDouble() < 0.1) ? 1 : 0);
            sb.AppendJoin(',', v).Append('\n');
        }
        return sb.ToString();
    }

    private static (string Dir, string Data) Setup(string text)
    {
        var dir = CliRunner.TempDir();
        var data = Path.Combine(dir, "train.csv");
        File.WriteAllText(data, text);
        return (dir, data);
    }

    [Fact]
    public void Writes_a_model_whose_metadata_records_the_data_the_options_and_the_epochs()
    {
        var (dir, data) = Setup(Csv(300, 1));
        var validation = Path.Combine(dir, "validation.csv");
        File.WriteAllText(validation, Csv(100, 2));
        var output = Path.Combine(dir, "model.json");
        var r = CliRunner.Run("train", "--data", data, "--hidden", "3", "--epochs", "12", "--seed", "5", "--validation", validation, "--patience", "4", "-o", output);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains("epoch 1/12", r.Out);
        Assert.Contains("1 unit(s) constant in the training rows", r.Out);
        Assert.Contains(": f", r.Out);
        var model = ModelJson.Read(output);
        Assert.Equal(ModelKind.Rbm, model.Kind);
        Assert.Equal(["a", "b", "c", "d", "e", "f"], model.Names.ToArray());
        Assert.Equal(3, model.Hidden);
        using var meta = JsonDocument.Parse(model.MetadataJson!);
        var t = meta.RootElement.GetProperty("training");
        // SHA-256 of the file's bytes, by .NET's SHA256 here (the metadata must name exactly the file trained on).
        Assert.Equal(Convert.ToHexStringLower(SHA256.HashData(File.ReadAllBytes(data))), t.GetProperty("data").GetProperty("sha256").GetString());
        Assert.Equal(300, t.GetProperty("data").GetProperty("rows").GetInt32());
        Assert.Equal(100, t.GetProperty("validation").GetProperty("rows").GetInt32());
        var o = t.GetProperty("options");
        Assert.Equal("rbm", o.GetProperty("kind").GetString());
        Assert.Equal("pcd", o.GetProperty("method").GetString());
        Assert.Equal(12, o.GetProperty("epochs").GetInt32());
        Assert.Equal(5UL, o.GetProperty("seed").GetUInt64());
        Assert.Equal(4, o.GetProperty("patience").GetInt32());
        int run = t.GetProperty("epochs_run").GetInt32(), kept = t.GetProperty("epoch_kept").GetInt32();
        Assert.InRange(kept, 1, run);
        Assert.True(t.TryGetProperty("validation_log_likelihood", out _));
        Assert.Equal("f", t.GetProperty("constant_units")[0].GetString());
        Assert.StartsWith("emit ", meta.RootElement.GetProperty("tool").GetString());
    }

    [Fact]
    public void Same_data_options_and_seed_give_the_same_bytes_whatever_the_threads()
    {
        var (dir, data) = Setup(Csv(200, 3));
        string Train(string threads, string name)
        {
            var output = Path.Combine(dir, name);
            var r = CliRunner.Run("train", "--data", data, "--hidden", "4", "--kind", "lateral", "--epochs", "5", "--threads", threads, "-o", output);
            Assert.True(r.ExitCode == 0, r.Error);
            return File.ReadAllText(output);
        }
        Assert.Equal(Train("1", "one.json"), Train("2", "two.json"));
    }

    [Fact]
    public void Does_not_replace_a_file_emit_did_not_write_unless_forced()
    {
        var (dir, data) = Setup(Csv(50, 4));
        var output = Path.Combine(dir, "model.json");
        File.WriteAllText(output, "mine");
        var r = CliRunner.Run("train", "--data", data, "--hidden", "2", "--epochs", "1", "-o", output);
        Assert.Equal(2, r.ExitCode);
        Assert.Equal("mine", File.ReadAllText(output));
        Assert.Equal(0, CliRunner.Run("train", "--data", data, "--hidden", "2", "--epochs", "1", "-o", output, "--force").ExitCode);
        Assert.NotEqual("mine", File.ReadAllText(output));
    }

    [Fact]
    public void Dash_writes_the_model_to_standard_output_and_progress_to_standard_error()
    {
        var (_, data) = Setup(Csv(50, 4));
        var r = CliRunner.Run("train", "--data", data, "--hidden", "2", "--epochs", "2", "-o", "-");
        Assert.Equal(0, r.ExitCode);
        Assert.Equal(2, ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(r.Out), "stdout").Hidden);
        Assert.Contains("epoch 2/2", r.Error);
    }

    public static TheoryData<string, string[], string> BadInputs => new()
    {
        { "a,b,c\n0,1,0\n1,1\n", [], "train.csv:3" },
        { "0,1,0\n0,2,0\n", [], "train.csv:2" },
        { "", [], "train.csv" },
        { "0,1,0\n1,1,0\n", ["--batch", "10"], "fewer than --batch 10" },
        { "0,1,0\n1,1,0\n", ["--hidden", "0"], "--hidden" },
        { "0,1,0\n1,1,0\n", ["--learning-rate", "NaN"], "--learning-rate" },
        { "0,1,0\n1,1,0\n", ["--learning-rate", "0"], "--learning-rate" },
        { "0,1,0\n1,1,0\n", ["--learning-rate", "-0.1"], "--learning-rate" },
        { "0,1,0\n1,1,0\n", ["--learning-rate", "Infinity"], "--learning-rate" },
        { "0,1,0\n1,1,0\n", ["--kind", "general", "--hidden", "17"], "--hidden" },
        { "0,1,0\n1,1,0\n", ["--kind", "boltzmann"], "--kind" },
    };

    [Theory]
    [MemberData(nameof(BadInputs))]
    public void Bad_input_is_one_line_naming_the_file_line_or_option_exit_2_and_no_file(string text, string[] extra, string where)
    {
        var (dir, data) = Setup(text);
        var output = Path.Combine(dir, "model.json");
        string[] args = ["train", "--data", data, "--hidden", "2", "-o", output, .. extra.Contains("--batch") ? [] : new[] { "--batch", "2" }];
        var r = CliRunner.Run([.. args, .. extra]);
        Assert.Equal(2, r.ExitCode);
        var lines = r.Error.TrimEnd('\n').Split('\n');
        Assert.Single(lines);
        Assert.Contains(where, lines[0]);
        Assert.False(File.Exists(output));
        Assert.DoesNotContain(Directory.GetFiles(dir), f => f != data);
    }

    [Fact]
    public void An_endless_device_as_training_data_is_one_line_exit_2_not_an_internal_error()
    {
        if (OperatingSystem.IsWindows()) return;
        // Reading /dev/zero whole ran out of array space (exit 3); the streamed reader stops at its line-length limit.
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("train", "--data", "/dev/zero", "--hidden", "2", "-o", Path.Combine(dir, "m.json"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("/dev/zero", r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
    }

    [Fact]
    public void Real_options_are_read_in_the_invariant_culture()
    {
        var (dir, data) = Setup("0,1,0\n1,1,0\n");
        var saved = System.Globalization.CultureInfo.CurrentCulture;
        try
        {
            System.Globalization.CultureInfo.CurrentCulture = new System.Globalization.CultureInfo("de-DE");
            var ok = CliRunner.Run("train", "--data", data, "--hidden", "2", "--batch", "2", "--epochs", "1", "--learning-rate", "0.05", "-o", Path.Combine(dir, "a.json"));
            Assert.True(ok.ExitCode == 0, ok.Error);
            var comma = CliRunner.Run("train", "--data", data, "--hidden", "2", "--batch", "2", "--epochs", "1", "--learning-rate", "0,05", "-o", Path.Combine(dir, "b.json"));
            Assert.Equal(2, comma.ExitCode);
            Assert.Contains("--learning-rate", comma.Error);
        }
        finally { System.Globalization.CultureInfo.CurrentCulture = saved; }
    }

    /// <summary>SIGINT to a real emit process (as Ctrl-C sends): it stops, says so, writes nothing and exits 130 (128 + SIGINT, common practice).</summary>
    [Fact]
    public async Task Ctrl_C_stops_training_writes_nothing_and_exits_130()
    {
        var (dir, data) = Setup(Csv(4000, 6));
        var output = Path.Combine(dir, "model.json");
        var dotnet = Toolchain.Require("dotnet");
        var psi = new ProcessStartInfo(dotnet)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in new[] { typeof(Emit.Cli.CliApp).Assembly.Location, "train", "--data", data, "--hidden", "8", "--epochs", "100000", "-o", output })
            psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        var err = p.StandardError.ReadToEndAsync();
        string? line;
        while ((line = p.StandardOutput.ReadLine()) is not null && !line.StartsWith("epoch 1/", StringComparison.Ordinal)) { }
        Assert.NotNull(line);
        using (var kill = Process.Start("kill", ["-INT", p.Id.ToString(System.Globalization.CultureInfo.InvariantCulture)])) kill.WaitForExit();
        var rest = p.StandardOutput.ReadToEndAsync();
        await p.WaitForExitAsync().WaitAsync(TimeSpan.FromSeconds(60));
        Assert.Equal(130, p.ExitCode);
        string errText = await err;
        Assert.Contains("training interrupted", errText);
        Assert.Contains("nothing written", errText);
        Assert.False(File.Exists(output));
        _ = await rest;
    }
}
