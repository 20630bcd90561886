using System.Collections.Immutable;
using System.Globalization;
using Emit.Model;
using Emit.Tests.Reference;

namespace Emit.Tests.Cli;

public sealed class ScoreCommandTests
{
    [Fact]
    public void Scores_every_vector_with_log_probability_and_flag()
    {
        var m = TestModels.Random(ModelKind.Lateral, 5, 3, 12, scale: 1.0);
        double logZ = BruteForce.LogPartition(m);
        m = m.With(threshold: 4.0, logPartition: new LogPartition(logZ, "exact", 0));
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var rows = Enumerable.Range(0, 32).Select(b => TestModels.Bits(b, 5)).ToList();
        var data = Path.Combine(dir, "v.csv");
        File.WriteAllLines(data, rows.Select(r => string.Join(",", r)));
        var outPath = Path.Combine(dir, "scores.csv");
        var r = CliRunner.Run("score", model, "--input", data, "--output", outPath);
        Assert.Equal(0, r.ExitCode);
        var lines = File.ReadAllLines(outPath);
        Assert.Equal("index,free_energy,log_probability,unusual", lines[0]);
        Assert.Equal(33, lines.Length);
        double sumP = 0;
        for (int k = 0; k < 32; k++)
        {
            var f = lines[k + 1].Split(',');
            Assert.Equal(k.ToString(CultureInfo.InvariantCulture), f[0]);
            double fe = double.Parse(f[1], CultureInfo.InvariantCulture);
            // Independent path: brute-force enumeration of the energy.
            Assert.Equal(BruteForce.FreeEnergy(m, rows[k]), fe, 12);
            sumP += Math.Exp(double.Parse(f[2], CultureInfo.InvariantCulture));
            Assert.Equal(fe > 4.0 ? "1" : "0", f[3]);
        }
        Assert.Equal(1.0, sumP, 12); // p(v) over all 2^5 vectors sums to one
    }

    [Fact]
    public void Reads_standard_input_and_writes_only_free_energy_without_extras()
    {
        var m = TestModels.Random(ModelKind.Rbm, 3, 2, 1);
        var model = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var r = CliRunner.RunWithInput("0 1 1\n1 0 0\n", "score", model, "--input", "-");
        Assert.Equal(0, r.ExitCode);
        var lines = r.Out.TrimEnd('\n').Split('\n');
        Assert.Equal("index,free_energy", lines[0]);
        Assert.Equal(3, lines.Length);
    }

    [Fact]
    public void A_header_in_another_order_than_the_model_is_refused()
    {
        var m = TestModels.Random(ModelKind.Rbm, 3, 2, 1);
        m = new BoltzmannModel(m.Kind, 3, 2, m.VisibleBias, m.HiddenBias, m.Weights, names: ImmutableArray.Create("a", "b", "c"));
        var model = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var r = CliRunner.RunWithInput("a,c,b\n0,1,1\n", "score", model, "--input", "-");
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("stdin:1", r.Error);
        Assert.Contains("column 2 is named \"c\"", r.Error);
    }

    [Fact]
    public void A_bad_row_names_line_and_column_and_leaves_no_output_file()
    {
        var m = TestModels.Random(ModelKind.Rbm, 3, 2, 1);
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var outPath = Path.Combine(dir, "out.csv");
        var r = CliRunner.RunWithInput("0,1,1\n0,2,1\n", "score", model, "--input", "-", "--output", outPath);
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("stdin:2:3", r.Error);
        Assert.False(File.Exists(outPath));
        Assert.Empty(Directory.GetFiles(dir, "*.tmp"));
    }
}
