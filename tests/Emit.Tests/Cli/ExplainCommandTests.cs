using System.Globalization;
using Emit.Model;
using Emit.Tests.Reference;

namespace Emit.Tests.Cli;

/// <summary><c>emit explain</c>: the CSV format, and each listed ΔF against brute-force flipping of the unit.</summary>
public sealed class ExplainCommandTests
{
    [Theory]
    [InlineData(ModelKind.Rbm)]
    [InlineData(ModelKind.Lateral)]
    [InlineData(ModelKind.General)]
    public void Lists_the_top_units_by_brute_force_delta(ModelKind kind)
    {
        var m = TestModels.Random(kind, 5, 4, 8, scale: 1.2);
        m = new BoltzmannModel(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, m.Weights, m.VisibleLinks, m.HiddenLinks,
            names: ["door", "fan, rear", "heater", "comp", "power"]);
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var rows = Enumerable.Range(0, 32).Select(b => TestModels.Bits(b, 5)).ToList();
        var data = Path.Combine(dir, "v.csv");
        File.WriteAllLines(data, rows.Select(r => string.Join(",", r)));
        var outPath = Path.Combine(dir, "why.csv");
        var r = CliRunner.Run("explain", model, "--input", data, "--top", "2", "-o", outPath);
        Assert.Equal(0, r.ExitCode);
        var lines = File.ReadAllLines(outPath);
        Assert.Equal("index,rank,unit,name,delta_free_energy", lines[0]);
        Assert.Equal(1 + 32 * 2, lines.Length);
        for (int k = 0; k < 32; k++)
        {
            double f = BruteForce.FreeEnergy(m, rows[k]);
            var deltas = Enumerable.Range(0, 5).Select(i =>
            {
                var v = (byte[])rows[k].Clone();
                v[i] ^= 1;
                return BruteForce.FreeEnergy(m, v) - f;
            }).ToArray();
            var expected = Enumerable.Range(0, 5).OrderBy(i => deltas[i]).Take(2).ToArray();
            for (int rank = 0; rank < 2; rank++)
            {
                var line = lines[1 + 2 * k + rank];
                var quoted = line.Contains("\"fan, rear\"", StringComparison.Ordinal);
                var fields = quoted ? line.Replace("\"fan, rear\"", "fan_rear").Split(',') : line.Split(',');
                Assert.Equal(k.ToString(CultureInfo.InvariantCulture), fields[0]);
                Assert.Equal((rank + 1).ToString(CultureInfo.InvariantCulture), fields[1]);
                int unit = int.Parse(fields[2], CultureInfo.InvariantCulture);
                Assert.Equal(deltas[expected[rank]], deltas[unit], 9); // same value (ties may swap units)
                Assert.Equal(deltas[unit], double.Parse(fields[4], CultureInfo.InvariantCulture), 9);
                Assert.Equal(unit == 1 ? "fan_rear" : m.Names[unit], fields[3]);
            }
        }
    }

    [Fact]
    public void Writes_to_standard_output_by_default_or_with_dash_and_refuses_top_zero()
    {
        var m = TestModels.Random(ModelKind.Rbm, 4, 2, 1);
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var r = CliRunner.RunWithInput("1,0,1,0\n0,0,0,0\n", "explain", model, "--input", "-", "--top", "9", "-o", "-");
        Assert.Equal(0, r.ExitCode);
        var lines = r.Out.Trim().Split('\n');
        Assert.Equal(1 + 2 * 4, lines.Length); // --top above the unit count lists every unit
        Assert.Equal("0,1,", lines[1][..4]);
        var bad = CliRunner.Run("explain", model, "--input", "-", "--top", "0");
        Assert.Equal(2, bad.ExitCode);
    }
}
