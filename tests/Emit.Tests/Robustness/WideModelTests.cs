using System.Text;
using Emit.Tests.Cli;
using Emit.Vectors;

namespace Emit.Tests.Robustness;

/// <summary>Models at the unit-count limit (2^20): buffers are sized in bytes, not as 4096 rows of any width.</summary>
public sealed class WideModelTests
{
    /// <summary>600 000 visible units (above 2^31 / 4096 = 524 288), one hidden unit, W_i0 = 0.001, all biases 0.</summary>
    private static string WideModel(string dir, string name)
    {
        const int v = 600_000;
        var sb = new StringBuilder("{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",\"visible\":600000,\"hidden\":1,\"visible_bias\":[");
        sb.Append(string.Join(",", Enumerable.Repeat("0", v))).Append("],\"hidden_bias\":[0],\"weights\":[");
        sb.Append(string.Join(",", Enumerable.Repeat("[0.001]", v))).Append("]}");
        var path = Path.Combine(dir, name);
        File.WriteAllText(path, sb.ToString());
        return path;
    }

    private static string Vectors(string dir)
    {
        // row 0: all off, F = −softplus(0) = −ln 2; row 1: 1000 units on, F = −softplus(1) = −ln(1 + e).
        var off = string.Join(",", Enumerable.Repeat("0", 600_000));
        var some = string.Join(",", Enumerable.Range(0, 600_000).Select(i => i < 1000 ? "1" : "0"));
        var path = Path.Combine(dir, "v.csv");
        File.WriteAllText(path, off + "\n" + some + "\n");
        return path;
    }

    [Fact]
    public void Batch_rows_shrink_with_the_width()
    {
        Assert.Equal(VectorBatch.MaxRows, VectorBatch.Rows(56));
        Assert.Equal(16, VectorBatch.Rows(1 << 20));
        Assert.Equal(1, VectorBatch.Rows(int.MaxValue));
        Assert.True((long)VectorBatch.Rows(600_000) * 600_000 <= VectorBatch.MaxBytes);
    }

    [Fact]
    public void Score_and_diff_read_vectors_of_600000_units()
    {
        var dir = CliRunner.TempDir();
        var model = WideModel(dir, "wide.json");
        var data = Vectors(dir);
        var r = CliRunner.Run("score", model, "--input", data);
        Assert.True(r.ExitCode == 0, r.Error);
        var lines = r.Out.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(3, lines.Length);
        // softplus(x) = ln(1 + e^x): F(0) = −ln 2, F(1000 · 0.001) = −ln(1 + e)
        Assert.Equal(-Math.Log(2), double.Parse(lines[1].Split(',')[1], System.Globalization.CultureInfo.InvariantCulture), 9);
        Assert.Equal(-Math.Log(1 + Math.E), double.Parse(lines[2].Split(',')[1], System.Globalization.CultureInfo.InvariantCulture), 9);

        var other = WideModel(dir, "wide2.json");
        var d = CliRunner.Run("diff", model, other, "--input", data);
        Assert.True(d.ExitCode == 0, d.Error);
    }

    [Fact]
    public void Verify_checks_generated_c_for_600000_units()
    {
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("verify", WideModel(dir, "wide.json"), "--input", Vectors(dir), "--target", "c", "--numeric", "f64");
        Assert.True(r.ExitCode == 0, r.Error + r.Out);
        Assert.Contains("pass", r.Out);
    }

    [Fact]
    public void Fixed_point_plans_a_model_with_65536_hidden_units()
    {
        // The plan search used to form a dense H×H matrix: 65536² wraps an int to 0 (internal error, exit 3).
        // The planner serves inspect and the bounds; generated code itself stops at ScorerPlan.MaxHidden.
        const int h = 1 << 16;
        var w = System.Collections.Immutable.ImmutableArray.CreateRange(
            Enumerable.Range(0, 4 * h).Select(k => 0.01 * ((k / h + k % h) % 7 - 3)));
        var model = new Emit.Model.BoltzmannModel(Emit.Model.ModelKind.Rbm, 4, h, [0.1, 0, 0, -0.1],
            System.Collections.Immutable.ImmutableArray.CreateRange(new double[h]), w, [], []);
        var plan = Emit.Quantize.FixedPointPlanner.Build(model);
        Assert.True(plan.ErrorBound > 0 && double.IsFinite(plan.ErrorBound));
    }

    [Theory]
    [InlineData("f64")]
    [InlineData("fixed")]
    public void Generated_code_refuses_more_hidden_units_than_its_stack_allows(string numeric)
    {
        // 2^20 accumulators of 8 bytes are 8 MiB of stack: the generated C crashed (SIGSEGV), the C# aborted.
        const int h = 1 << 20;
        var dir = CliRunner.TempDir();
        var model = HostileModelTests.Rbm(dir, "m.json", [0.0], new double[h], [new double[h]]);
        var r = CliRunner.Run("compile", model, "--numeric", numeric, "--target", "c,csharp", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("stack", r.Error);
        Assert.Contains("16384", r.Error);
    }
}
