using System.Collections.Immutable;
using System.Globalization;
using System.Text.Json;
using Emit.Model;

namespace Emit.Tests.Cli;

/// <summary>The command-line vocabulary of docs/cli.md: -o/--output FILE with - for standard output, --json as a switch, --report FILE, former spellings.</summary>
public sealed class VocabularyTests
{
    private static (string Dir, string Model, string Data) Make(ImmutableArray<string> names = default)
    {
        var dir = CliRunner.TempDir();
        var m = TestModels.Random(ModelKind.Rbm, 3, 2, 11);
        m = new BoltzmannModel(m.Kind, 3, 2, m.VisibleBias, m.HiddenBias, m.Weights, names: names, threshold: 0.5);
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var data = Path.Combine(dir, "v.csv");
        File.WriteAllText(data, "0,1,1\n1,0,0\n");
        return (dir, model, data);
    }

    [Fact]
    public void Dash_as_output_means_standard_output()
    {
        var (dir, model, data) = Make();
        var score = CliRunner.Run("score", model, "-i", data, "-o", "-");
        Assert.Equal(0, score.ExitCode);
        Assert.StartsWith("index,free_energy,unusual\n0,", score.Out);
        Assert.False(File.Exists(Path.Combine(dir, "-")));

        var vectors = CliRunner.Run("vectors", model, "--count", "4", "-o", "-");
        Assert.Equal(0, vectors.ExitCode);
        Assert.Equal(4, vectors.Out.TrimEnd('\n').Split('\n').Length);
        Assert.Contains("wrote 4 vectors to standard output", vectors.Error);

        var import = CliRunner.Run("import", model, "-o", "-");
        Assert.Equal(0, import.ExitCode);
        Assert.Equal(ModelJson.Read(model).Sha256, ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(import.Out), "stdout").Sha256);
    }

    [Fact]
    public void Former_spellings_still_work_for_one_release_with_a_warning()
    {
        var (dir, model, data) = Make();
        var vectors = CliRunner.Run("vectors", model, "--count", "4", "--out", Path.Combine(dir, "a.csv"));
        Assert.Equal(0, vectors.ExitCode);
        Assert.True(File.Exists(Path.Combine(dir, "a.csv")));
        Assert.Contains("emit: warning: --out FILE is now -o/--output FILE", vectors.Error);

        var import = CliRunner.Run("import", model, "--out", Path.Combine(dir, "b.json"));
        Assert.Equal(0, import.ExitCode);
        Assert.True(File.Exists(Path.Combine(dir, "b.json")));
        Assert.Contains("emit: warning: --out FILE is now -o/--output FILE", import.Error);

        var diff = CliRunner.Run("diff", model, model, "-i", data, "--json", Path.Combine(dir, "d.json"));
        Assert.True(diff.ExitCode == 0, diff.Error);
        Assert.Contains("emit: warning: --json FILE is now --report FILE", diff.Error);
        Assert.Equal(2, JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "d.json"))).RootElement.GetProperty("vectors").GetInt64());

        Assert.Equal(2, CliRunner.Run("import", model, "--out", "x.json", "-o", "y.json").ExitCode);
        Assert.DoesNotMatch(@"--out(?!put)", CliRunner.Run("vectors", "--help").Out);   // hidden from help
    }

    [Fact]
    public void Json_is_a_switch_that_replaces_text_on_standard_output()
    {
        var (dir, model, data) = Make();
        var diff = CliRunner.Run("diff", model, model, "-i", data, "--json");
        Assert.Equal(0, diff.ExitCode);
        var root = JsonDocument.Parse(diff.Out).RootElement;
        Assert.Equal(0.0, root.GetProperty("free_energy_change").GetProperty("max_abs").GetDouble());
        Assert.Equal(0, root.GetProperty("firmware_changes").GetArrayLength());

        var both = CliRunner.Run("diff", model, model, "-i", data, "--report", Path.Combine(dir, "r.json"));
        Assert.Equal(0, both.ExitCode);
        Assert.Contains("free energy change", both.Out);
        Assert.True(File.Exists(Path.Combine(dir, "r.json")));
    }

    [Fact]
    public void A_non_finite_reference_score_is_an_error_not_a_row()
    {
        // F(v) = -b.v - sum_j softplus(c_j + W_j.v): with W = 1e308 on two active units the pre-activation exceeds
        // DBL_MAX (IEEE 754 binary64), so F is -infinity.
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "huge.json");
        ModelJson.WriteFile(new BoltzmannModel(ModelKind.Rbm, 2, 1, [0, 0], [0], [1e308, 1e308]), model, force: true);
        var r = CliRunner.RunWithInput("0,1\n1,1\n", "score", model, "-i", "-");
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("emit: error: stdin: vector 1: the free energy is beyond double precision", r.Error);
        Assert.DoesNotContain("Infinity", r.Out);
        var first = double.Parse(r.Out.Split('\n')[1].Split(',')[1], CultureInfo.InvariantCulture);
        Assert.Equal(-1e308, first);   // softplus(1e308) = 1e308
    }
}
