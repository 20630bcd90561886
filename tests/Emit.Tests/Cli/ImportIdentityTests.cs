using System.Collections.Immutable;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Cli;

/// <summary>emit import keeps a model's identity (unit names, threshold); emit diff says what breaks firmware.</summary>
public sealed class ImportIdentityTests
{
    private static string Npz() => Emit.Tests.Model.NpzFixtures.Path("fmt_f4_be_c_deflated.npz");

    private static int Visible() => NpzModelReader.Read(Npz()).Visible;

    [Fact]
    public void Names_from_a_csv_header_and_a_threshold_are_stored()
    {
        var dir = CliRunner.TempDir();
        int v = Visible();
        var names = Enumerable.Range(0, v).Select(i => $"flag {i}").ToArray();
        var csv = Path.Combine(dir, "train.csv");
        File.WriteAllText(csv, string.Join(",", names) + "\n" + string.Join(",", Enumerable.Repeat("0", v)) + "\n");
        var outPath = Path.Combine(dir, "m.json");
        var r = CliRunner.Run("import", Npz(), "--names", csv, "--threshold", "-2.5", "-o", outPath);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Equal("", r.Error);   // nothing missing, nothing to say
        var m = ModelJson.Read(outPath);
        Assert.Equal(names, m.Names.ToArray());
        Assert.Equal(-2.5, m.Threshold);
        Assert.Equal(NpzModelReader.Read(Npz()).Weights.ToArray(), m.Weights.ToArray());
    }

    [Fact]
    public void Names_one_per_line_are_stored_and_a_wrong_count_names_the_line()
    {
        var dir = CliRunner.TempDir();
        int v = Visible();
        var list = Path.Combine(dir, "names.txt");
        File.WriteAllText(list, string.Concat(Enumerable.Range(0, v).Select(i => $" unit_{i} \r\n")) + "\n");
        var outPath = Path.Combine(dir, "m.json");
        var r = CliRunner.Run("import", Npz(), "--names", list, "-o", outPath);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains("no threshold", r.Error);
        Assert.DoesNotContain("no unit names", r.Error);
        Assert.Equal("unit_0", ModelJson.Read(outPath).Names[0]);
        Assert.Equal($"unit_{v - 1}", ModelJson.Read(outPath).Names[^1]);

        File.WriteAllText(list, "a\nb\n");
        var shortList = CliRunner.Run("import", Npz(), "--names", list, "-o", Path.Combine(dir, "n.json"));
        Assert.Equal(2, shortList.ExitCode);
        Assert.Contains($"emit: error: {list}:3: has 2 names, expected {v}", shortList.Error);
        File.WriteAllText(list, string.Concat(Enumerable.Range(0, v).Select(i => i == 3 ? "unit_0\n" : $"unit_{i}\n")));
        var repeated = CliRunner.Run("import", Npz(), "--names", list, "-o", Path.Combine(dir, "n.json"));
        Assert.Equal(2, repeated.ExitCode);
        Assert.Contains($"{list}:4: the name on this line repeats line 1", repeated.Error);
        Assert.False(File.Exists(Path.Combine(dir, "n.json")));
    }

    private static BoltzmannModel Base(ImmutableArray<string> names = default, double scale = 1.0)
    {
        var m = TestModels.Random(ModelKind.Rbm, 3, 2, 21);
        return new BoltzmannModel(m.Kind, 3, 2, m.VisibleBias, m.HiddenBias, [.. m.Weights.Select(w => w * scale)], names: names, threshold: 0.0);
    }

    private static string Write(string dir, string file, BoltzmannModel m)
    {
        var path = Path.Combine(dir, file);
        ModelJson.WriteFile(m, path, force: true);
        return path;
    }

    [Fact]
    public void Diff_warns_when_only_one_model_has_names_and_lists_what_breaks_firmware()
    {
        var dir = CliRunner.TempDir();
        var named = Write(dir, "plant.json", Base(ImmutableArray.Create("door", "fan", "heater")));
        var plain = Write(dir, "plant-v2.json", Base());
        var r = CliRunner.RunWithInput("0,1,1\n", "diff", named, plain, "-i", "-");
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains("emit: warning: plant.json has unit names and plant-v2.json has none", r.Error);
        Assert.Contains("firmware: breaks code built against the old scorer: default scorer name plant becomes plant_v2", r.Out);
        Assert.Contains("(compile both with the same --name to keep them)", r.Out);
        Assert.Contains("the new model has no unit names: the per-unit macros and constants disappear", r.Out);

        var renamed = Write(dir, "plant2.json", Base(ImmutableArray.Create("door", "heater", "fan")));
        Write(dir, "plant.json", Base(ImmutableArray.Create("door", "fan", "heater")));
        var moved = CliRunner.RunWithInput("0,1,1\n", "diff", named, renamed, "-i", "-");
        Assert.Contains("2 units keep their name at another position", moved.Out);
    }

    [Fact]
    public void Diff_reports_a_changed_unit_count_before_refusing_to_compare()
    {
        var dir = CliRunner.TempDir();
        var a = Write(dir, "m.json", Base());
        var m4 = TestModels.Random(ModelKind.Rbm, 4, 2, 2);
        var b = Write(dir, "sub/m.json", m4);
        var r = CliRunner.RunWithInput("0,1,1\n", "diff", a, b, "-i", "-");
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("emit: warning: breaks firmware built against the old scorer: visible units 3 become 4", r.Error);
        Assert.Contains("emit: error: the models have 3 and 4 visible units", r.Error);
    }

    [Fact]
    public void Diff_reports_a_changed_fixed_point_energy_format()
    {
        var dir = CliRunner.TempDir();
        var small = Base();
        var large = Base(scale: 1000.0);
        // Expected from the planner itself is circular; the check is only that a change of the planned format
        // (Q formats, docs/fixed-point.md) is reported, and nothing is when the formats agree.
        var fSmall = FixedPointPlanner.Build(small, new FixedPointOptions()).EnergyFormat.ToString();
        var fLarge = FixedPointPlanner.Build(large, new FixedPointOptions()).EnergyFormat.ToString();
        Assert.NotEqual(fSmall, fLarge);
        var r = CliRunner.RunWithInput("0,1,1\n", "diff", Write(dir, "m.json", small), Write(Directory.CreateDirectory(Path.Combine(dir, "n")).FullName, "m.json", large), "-i", "-");
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains($"fixed-point energy format {fSmall} becomes {fLarge}", r.Out);
        Assert.Empty(ScorerInterface.Changes(ScorerInterface.Of(small, "m.json"), ScorerInterface.Of(small, "m.json")));
    }
}
