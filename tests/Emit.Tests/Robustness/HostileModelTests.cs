using System.Globalization;
using System.Text;
using Emit.Quantize;
using Emit.Emission;
using Emit.Tests.Cli;

namespace Emit.Tests.Robustness;

/// <summary>
/// Hostile model files: values at the edge of what a numeric mode can hold. Each case must end in exit 0 with a
/// sound scorer or in exit 2 with one line, never in an internal error or a scorer whose bound does not hold.
/// </summary>
public sealed class HostileModelTests
{
    private static string Num(double x) => x.ToString("R", CultureInfo.InvariantCulture);

    /// <summary>Writes an RBM model file with the given rows of W (one row per visible unit).</summary>
    internal static string Rbm(string dir, string name, double[] b, double[] c, double[][] w, string extra = "")
    {
        var sb = new StringBuilder();
        sb.Append("{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",");
        sb.Append($"\"visible\":{b.Length},\"hidden\":{c.Length},");
        sb.Append("\"visible_bias\":[").Append(string.Join(",", b.Select(Num))).Append("],");
        sb.Append("\"hidden_bias\":[").Append(string.Join(",", c.Select(Num))).Append("],");
        sb.Append("\"weights\":[").Append(string.Join(",", w.Select(r => "[" + string.Join(",", r.Select(Num)) + "]"))).Append(']');
        sb.Append(extra).Append('}');
        var path = Path.Combine(dir, name);
        File.WriteAllText(path, sb.ToString());
        return path;
    }

    /// <summary>V visible, 2 hidden, W_ij = ±magnitude alternating with i + j.</summary>
    private static string Alternating(string dir, int visible, double magnitude) => Rbm(dir, "alt.json",
        new double[visible], new double[2],
        [.. Enumerable.Range(0, visible).Select(i => new[] { (i % 2 == 0 ? 1 : -1) * magnitude, (i % 2 == 0 ? -1 : 1) * magnitude })]);

    [Fact]
    public void F32_is_refused_when_a_pre_activation_can_exceed_FLT_MAX()
    {
        // 20 units of +2e37 on give a pre-activation of 4e38 > FLT_MAX = (2 − 2^−23)·2^127 ≈ 3.4028235e38 (IEEE 754
        // binary32); the free energy of that input (−4e38) does not fit either, but the self-test vectors miss it.
        var dir = CliRunner.TempDir();
        var model = Alternating(dir, 40, 2e37);
        var r = CliRunner.Run("compile", model, "--numeric", "f32", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("f64", r.Error);
        Assert.Contains("FLT_MAX", r.Error);
        Assert.False(Directory.Exists(Path.Combine(dir, "out")) && Directory.EnumerateFiles(Path.Combine(dir, "out")).Any());
    }

    [Fact]
    public void F32_still_compiles_a_model_whose_every_partial_sum_fits()
    {
        // 5 units of +2e37 give 1e38; two softplus terms and the sum stay below 3.4e38.
        var dir = CliRunner.TempDir();
        var model = Alternating(dir, 10, 2e37);
        var r = CliRunner.Run("compile", model, "--numeric", "f32", "--out", Path.Combine(dir, "out"));
        Assert.True(r.ExitCode == 0, r.Error);
    }

    [Fact]
    public void F32_is_refused_when_partial_sums_overflow_although_the_total_cancels()
    {
        // W_i = +2e37 for the first 20 units and −2e37 for the rest: all units on gives 0, but the running sum passes
        // 4e38 on the way (C99 adds in the order written, 5.1.2.3).
        var dir = CliRunner.TempDir();
        var model = Rbm(dir, "ps.json", new double[40], [0.0],
            [.. Enumerable.Range(0, 40).Select(i => new[] { i < 20 ? 2e37 : -2e37 })]);
        var r = CliRunner.Run("compile", model, "--numeric", "f32", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("pre-activation", r.Error);
    }

    [Theory]
    [InlineData("[1e308,-1e308]", "[0.0]")]   // the bound's Σ|b_i| overflows double
    [InlineData("[0.0,0.0]", "[1e308]")]      // softplus(1e308 + 1e308·u) and the energy sum
    public void F64_refuses_a_model_whose_bound_or_range_is_not_finite(string visibleBias, string hiddenBias)
    {
        var dir = CliRunner.TempDir();
        var path = Path.Combine(dir, "m.json");
        File.WriteAllText(path, "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",\"visible\":2,\"hidden\":1," +
            $"\"visible_bias\":{visibleBias},\"hidden_bias\":{hiddenBias},\"weights\":[[1e308],[1e308]]}}");
        var r = CliRunner.Run("compile", path, "--numeric", "f64", "--target", "c,csharp", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("DBL_MAX", r.Error);
        Assert.DoesNotContain("internal error", r.Error);
    }

    [Fact]
    public void No_literal_is_ever_written_for_NaN_or_infinity()
    {
        // C99 6.4.4.2 and C# have no such literals; "NaN.0" would not compile.
        Assert.Throws<EmitException>(() => Literals.Double(double.NaN));
        Assert.Throws<EmitException>(() => Literals.Double(double.PositiveInfinity));
        Assert.Throws<EmitException>(() => Literals.Float(float.NegativeInfinity));
        Assert.Throws<EmitException>(() => Literals.Upward(double.NaN, NumericMode.F64));
    }

    [Theory]
    [InlineData(1e27)]
    [InlineData(1e36)]
    [InlineData(1e300)]
    public void Fixed_point_refuses_huge_weights_with_exit_2(double w)
    {
        var dir = CliRunner.TempDir();
        var model = Rbm(dir, "m.json", [0.0, 0.0], [0.0], [[w], [0.2]]);
        var r = CliRunner.Run("compile", model, "--numeric", "fixed", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("too large for fixed point", r.Error);
    }

    [Fact]
    public void Fixed_point_refuses_huge_lateral_weights_with_exit_2()
    {
        var dir = CliRunner.TempDir();
        var path = Path.Combine(dir, "m.json");
        File.WriteAllText(path, "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"lateral\",\"visible\":2,\"hidden\":1," +
            "\"visible_bias\":[0.0,0.0],\"hidden_bias\":[0.0],\"weights\":[[0.1],[0.2]],\"visible_links\":[[0,1,1e300]]}");
        var r = CliRunner.Run("compile", path, "--numeric", "fixed", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
    }

    [Theory]
    [InlineData("\"log_partition\":{\"value\":1.0,\"value\":2.0}", "log_partition")]
    [InlineData("\"log_partition\":{\"value\":1.0,\"method\":\"exact\",\"method\":\"ais\"}", "log_partition")]
    [InlineData("\"metadata\":{\"a\":1,\"a\":2}", "metadata")]
    [InlineData("\"metadata\":{\"a\":[{\"b\":1},{\"b\":1,\"c\":{\"d\":0,\"d\":0}}]}", "metadata")]
    [InlineData("\"threshold\":1.0,\"threshold\":2.0", "\"threshold\" appears twice")]
    public void A_field_named_twice_is_refused_at_every_depth(string fields, string expected)
    {
        // RFC 8259 §4: object names SHOULD be unique; readers disagree on which duplicate wins, so emit refuses.
        var json = "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",\"visible\":1,\"hidden\":1," +
            "\"visible_bias\":[0.0],\"hidden_bias\":[0.0],\"weights\":[[0.5]]," + fields + "}";
        var e = Assert.Throws<EmitException>(() => Emit.Model.ModelJson.Parse(Encoding.UTF8.GetBytes(json), "m.json"));
        Assert.Contains("twice", e.Message);
        Assert.Contains(expected, e.Message);
        Assert.NotNull(e.Line);
    }

    [Fact]
    public void Metadata_with_distinct_names_at_every_depth_is_kept()
    {
        var json = "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",\"visible\":1,\"hidden\":1," +
            "\"visible_bias\":[0.0],\"hidden_bias\":[0.0],\"weights\":[[0.5]],\"metadata\":{\"a\":{\"a\":[{\"a\":1},{\"a\":2}]}}}";
        var m = Emit.Model.ModelJson.Parse(Encoding.UTF8.GetBytes(json), "m.json");
        Assert.Contains("\"a\":2", m.MetadataJson);
    }
}
