using Emit.Model;
using Emit.Tests.Model;

namespace Emit.Tests.Cli;

/// <summary><c>emit import</c> on files numpy wrote (tests/reference/make_fixtures.py).</summary>
public sealed class ImportCommandTests
{
    [Theory]
    [InlineData("sklearn_digits_rbm.npz")]
    [InlineData("fmt_f4_be_c_deflated.npz")]
    public void Import_writes_a_model_file_holding_numpys_arrays(string name)
    {
        var dir = CliRunner.TempDir();
        var outPath = Path.Combine(dir, "model.json");
        var result = CliRunner.Run("import", NpzFixtures.Path(name), "-o", outPath);
        Assert.Equal(0, result.ExitCode);
        // Without --names and --threshold, import says what the model lacks.
        Assert.Contains("emit: note: the model has no unit names", result.Error);
        Assert.Contains("emit: note: the model has no threshold", result.Error);

        // Source of the expected values: numpy's ndarray.tolist() of the arrays it saved (expected_arrays.json).
        var expected = NpzFixtures.Expected(name);
        var written = ModelJson.Read(outPath);
        Assert.Equal(ModelKind.Rbm, written.Kind);
        Assert.Equal(expected.VisibleBias, written.VisibleBias.ToArray());
        Assert.Equal(expected.HiddenBias, written.HiddenBias.ToArray());
        for (int i = 0; i < written.Visible; i++)
            Assert.Equal(expected.Weights[i], written.WeightRow(i).ToArray());
        Assert.Equal(NpzModelReader.Read(NpzFixtures.Path(name)).Sha256, written.Sha256);
        Assert.Contains(written.Sha256, result.Out);
    }

    [Theory]
    [InlineData("err_nan.npz", "array entry weights.npy: element [1, 2] is NaN")]
    [InlineData("err_plain_npy.npz", "is a single .npy array")]
    public void Bad_npz_exits_2_with_one_line_and_writes_nothing(string name, string problem)
    {
        var dir = CliRunner.TempDir();
        var outPath = Path.Combine(dir, "model.json");
        var path = NpzFixtures.Path(name);
        var result = CliRunner.Run("import", path, "-o", outPath);
        Assert.Equal(2, result.ExitCode);
        Assert.StartsWith($"emit: error: {path}: ", result.Error);
        Assert.Contains(problem, result.Error);
        Assert.Single(result.Error.TrimEnd('\n').Split('\n'));
        Assert.False(File.Exists(outPath));
        Assert.Empty(Directory.GetFiles(dir));
    }

    [Fact]
    public void Truncated_npz_exits_2()
    {
        var dir = CliRunner.TempDir();
        var cut = Path.Combine(dir, "cut.npz");
        var bytes = File.ReadAllBytes(NpzFixtures.Path("sklearn_digits_rbm.npz"));
        File.WriteAllBytes(cut, bytes[..(bytes.Length / 2)]);
        var result = CliRunner.Run("import", cut, "--output", Path.Combine(dir, "m.json"));
        Assert.Equal(2, result.ExitCode);
        Assert.StartsWith($"emit: error: {cut}: ", result.Error);
    }
}
