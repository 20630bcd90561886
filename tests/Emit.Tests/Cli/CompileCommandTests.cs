using Emit.Cli;
using Emit.Emission;
using Emit.Model;
using Emit.Tests.Emission;

namespace Emit.Tests.Cli;

public sealed class CompileCommandTests
{
    private static (int Exit, string Out, string Err) Emit(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int exit = CliApp.Run(args, o, e);
        return (exit, o.ToString(), e.ToString());
    }

    private static string ModelFile(string dir, string fileName, BoltzmannModel model)
    {
        var path = Path.Combine(dir, fileName);
        ModelJson.WriteFile(model, path, force: true);
        return path;
    }

    private static BoltzmannModel Small => TestModels.Random(ModelKind.Lateral, 10, 4, seed: 1).With(threshold: 2.0, null);

    [Fact]
    public void Writes_c_by_default_with_the_name_from_the_file()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "pump-station.json", Small);
        var (exit, stdout, err) = Emit("compile", model, "--out", Path.Combine(dir, "out"));
        Assert.True(exit == 0, err);
        Assert.True(File.Exists(Path.Combine(dir, "out", "pump_station.h")));
        Assert.True(File.Exists(Path.Combine(dir, "out", "pump_station.c")));
        Assert.False(File.Exists(Path.Combine(dir, "out", "pump_station.cs")));
        Assert.Contains("pump_station.c", stdout);
        var header = File.ReadAllText(Path.Combine(dir, "out", "pump_station.h"));
        Assert.Contains("--numeric f32", header);                    // default numeric mode
        Assert.Contains("typedef float pump_station_energy_t;", header);
    }

    [Fact]
    public void Writes_both_targets_with_explicit_options()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var (exit, _, err) = Emit("compile", model, "--target", "c,csharp", "--numeric", "f64", "--name", "plant_a",
            "--namespace", "Plant.Monitoring", "--selftest-vectors", "3", "--out", dir);
        Assert.True(exit == 0, err);
        var cs = File.ReadAllText(Path.Combine(dir, "plant_a.cs"));
        Assert.Contains("namespace Plant.Monitoring", cs);
        Assert.Contains("public static class PlantA", cs);
        Assert.Contains("public const int SelfTestVectors = 3;", cs);
        Assert.Contains("typedef double plant_a_energy_t;", File.ReadAllText(Path.Combine(dir, "plant_a.h")));
    }

    [Fact]
    public void Fixed_mode_takes_the_fixed_point_options_and_states_them()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var (exit, _, err) = Emit("compile", model, "--target", "c,csharp", "--numeric", "fixed", "--weights", "int8",
            "--accumulator", "int64", "--softplus-table", "64", "--name", "plant_q", "--out", dir);
        Assert.True(exit == 0, err);
        var h = File.ReadAllText(Path.Combine(dir, "plant_q.h"));
        Assert.Contains("options: --target c --numeric fixed --weights int8 --accumulator int64 --softplus-table 64\n *          --name plant_q", h);
        Assert.Contains("typedef int64_t plant_q_energy_t;", h);
        Assert.Contains("typedef int8_t plant_q_weight_t;", h);
        Assert.Matches(@"#define PLANT_Q_ERROR_BOUND \d\.\d+(e-\d+)?\n", h);
        var c = File.ReadAllText(Path.Combine(dir, "plant_q.c")).Replace("uint16_t", "int32_t", StringComparison.Ordinal);
        Assert.Contains("static const int32_t plant_q_softplus_table[] PLANT_Q_TABLE_ATTR", c);
        Assert.Contains("PLANT_Q_COUNT(plant_q_softplus_table)\n               == (size_t)(65)", c);
        var cs = File.ReadAllText(Path.Combine(dir, "plant_q.cs"));
        Assert.Contains("public static long FreeEnergy(", cs);
        Assert.Contains("ReadOnlySpan<sbyte> WeightTable", cs);
    }

    [Theory]
    [InlineData("--weights", "int8")]
    [InlineData("--accumulator", "int64")]
    [InlineData("--softplus-table", "64")]
    public void Fixed_point_options_without_numeric_fixed_exit_2(string option, string value)
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var (exit, _, err) = Emit("compile", model, option, value, "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, exit);
        Assert.Contains($"{option} applies to --numeric fixed only", err);
    }

    [Fact]
    public void Fixed_mode_refuses_a_table_size_that_is_not_a_power_of_two()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var (exit, _, err) = Emit("compile", model, "--numeric", "fixed", "--softplus-table", "100", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, exit);
        Assert.StartsWith("emit: error: --softplus-table 100 is not allowed", err);
    }

    [Theory]
    [InlineData("--name", "9lives")]
    [InlineData("--name", "pump-a")]
    [InlineData("--target", "rust")]
    [InlineData("--numeric", "f16")]
    [InlineData("--weights", "int4")]
    [InlineData("--accumulator", "int16")]
    [InlineData("--softplus-table", "100")]
    [InlineData("--namespace", "a..b")]
    [InlineData("--selftest-vectors", "0")]
    [InlineData("--no-such-option", "x")]
    public void Bad_options_exit_2_with_one_line_and_write_nothing(string option, string value)
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var outDir = Path.Combine(dir, "out");
        var (exit, _, err) = Emit("compile", model, option, value, "--out", outDir);
        Assert.Equal(2, exit);
        Assert.StartsWith("emit: error: ", err);
        Assert.DoesNotContain("   at ", err);
        Assert.False(Directory.Exists(outDir) && Directory.EnumerateFileSystemEntries(outDir).Any());
    }

    [Fact]
    public void Missing_model_file_exits_2()
    {
        var (exit, _, err) = Emit("compile", "/no/such/model.json");
        Assert.Equal(2, exit);
        Assert.StartsWith("emit: error: ", err);
    }

    [Fact]
    public void General_model_with_too_many_hidden_units_is_refused_with_the_reason()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "g.json", TestModels.Random(ModelKind.General, 3, FloatScorerPlan.MaxGeneralHidden + 1, seed: 2, linkDensity: 0.1));
        var (exit, _, err) = Emit("compile", model, "--out", dir);
        Assert.Equal(2, exit);
        Assert.Contains("2^17 hidden states", err);
        Assert.Contains("hidden <= 16", err);
    }

    [Fact]
    public void A_file_emit_did_not_generate_is_not_overwritten_without_force()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var handWritten = Path.Combine(dir, "m.c");
        File.WriteAllText(handWritten, "/* my own code */\n");
        var (exit, _, err) = Emit("compile", model, "--out", dir);
        Assert.Equal(2, exit);
        Assert.Contains("--force", err);
        Assert.Equal("/* my own code */\n", File.ReadAllText(handWritten));
        Assert.False(File.Exists(Path.Combine(dir, "m.h")));   // nothing written when one file is refused

        Assert.Equal(0, Emit("compile", model, "--out", dir, "--force").Exit);
        Assert.Contains("generated by emit", File.ReadAllText(handWritten));
        Assert.Equal(0, Emit("compile", model, "--out", dir).Exit);  // regenerating over emit's own files is fine
    }

    [Fact]
    public void Template_override_replaces_one_file_and_errors_name_the_template_line()
    {
        var dir = Toolchain.TempDir("cli");
        var model = ModelFile(dir, "m.json", Small);
        var templates = Path.Combine(dir, "templates", "c");
        Directory.CreateDirectory(templates);
        File.WriteAllText(Path.Combine(templates, CEmitter.HeaderTemplate), "/* generated by emit, custom banner */\n/* {{ d.UName }}_VISIBLE = {{ p.Visible }} */\n");
        var (exit, _, err) = Emit("compile", model, "--out", Path.Combine(dir, "out"), "--templates", Path.Combine(dir, "templates"));
        Assert.True(exit == 0, err);
        Assert.Equal("/* generated by emit, custom banner */\n/* M_VISIBLE = 10 */\n", File.ReadAllText(Path.Combine(dir, "out", "m.h")));
        Assert.Contains("--templates (custom)", File.ReadAllText(Path.Combine(dir, "out", "m.c")));   // the other file is the shipped one

        File.WriteAllText(Path.Combine(templates, CEmitter.HeaderTemplate), "line one\n{{ p.NoSuchMember }}\n");
        (exit, _, err) = Emit("compile", model, "--out", Path.Combine(dir, "out2"), "--templates", Path.Combine(dir, "templates"));
        Assert.Equal(2, exit);
        Assert.Contains(CEmitter.HeaderTemplate + ":2:", err);

        File.WriteAllText(Path.Combine(templates, CEmitter.HeaderTemplate), "{{ if }}\n");
        (exit, _, err) = Emit("compile", model, "--out", Path.Combine(dir, "out2"), "--templates", Path.Combine(dir, "templates"));
        Assert.Equal(2, exit);
        Assert.Contains(CEmitter.HeaderTemplate + ":1:", err);

        File.Delete(Path.Combine(templates, CEmitter.HeaderTemplate));
        File.WriteAllText(Path.Combine(templates, "scorer.hh.sbn"), "x");
        (exit, _, err) = Emit("compile", model, "--out", Path.Combine(dir, "out2"), "--templates", Path.Combine(dir, "templates"));
        Assert.Equal(2, exit);
        Assert.Contains("unknown template file name", err);
    }

    [Fact]
    public void Help_lists_the_targets_from_the_target_table()
    {
        var (_, stdout, _) = Emit("compile", "--help");
        Assert.Contains("--target <" + string.Join("|", Targets.All.Select(t => t.Name)) + ",...>", stdout);
    }

    [Fact]
    public void A_failed_write_leaves_the_folder_as_it_was()
    {
        var dir = Toolchain.TempDir("cli");
        var outDir = Path.Combine(dir, "out");
        Assert.Equal(0, Emit("compile", ModelFile(dir, "m.json", Small), "--out", outDir).Exit);
        string Snapshot() => string.Join("\n--\n", Directory.GetFileSystemEntries(outDir).Order().Select(p => p + (File.Exists(p) ? "\n" + File.ReadAllText(p) : "/")));
        var other = ModelFile(dir, "other.json", TestModels.Random(ModelKind.Rbm, 5, 2, seed: 3));

        // writing the second file fails (as on a full disk) before anything is renamed
        var before = Snapshot();
        var failing = Path.Combine(outDir, "m.c");
        AtomicFile.BeforeTempWrite = p => { if (p == failing) throw new IOException("No space left on device (test)"); };
        int exit;
        string err;
        try { (exit, _, err) = Emit("compile", other, "--name", "m", "--out", outDir); }
        finally { AtomicFile.BeforeTempWrite = null; }
        Assert.Equal(2, exit);
        Assert.StartsWith("emit: error: ", err);
        Assert.Equal(before, Snapshot());

        // an output name taken by a folder is refused before anything is written
        File.Delete(Path.Combine(outDir, "m.c"));
        Directory.CreateDirectory(Path.Combine(outDir, "m.c"));
        before = Snapshot();
        (exit, _, err) = Emit("compile", other, "--name", "m", "--out", outDir);
        Assert.Equal(2, exit);
        Assert.Contains("the output is a folder", err);
        Assert.Equal(before, Snapshot());
    }
}
