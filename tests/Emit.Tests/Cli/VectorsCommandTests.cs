using System.Collections.Immutable;
using Emit.Model;
using Emit.Vectors;

namespace Emit.Tests.Cli;

public sealed class VectorsCommandTests
{
    [Fact]
    public void Writes_a_deterministic_file_the_vector_reader_reads_back_with_names()
    {
        var m = TestModels.Random(ModelKind.Rbm, 6, 3, 2);
        m = new BoltzmannModel(m.Kind, 6, 3, m.VisibleBias, m.HiddenBias, m.Weights,
            names: ImmutableArray.Create("door, rear", "fan \"hi\"", "c", "d", "e", "f"), threshold: 0.0);
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var a = CliRunner.Run("vectors", model, "--count", "50", "-o", Path.Combine(dir, "a.csv"), "--seed", "4");
        var b = CliRunner.Run("vectors", model, "--count", "50", "-o", Path.Combine(dir, "b.csv"), "--seed", "4");
        Assert.Equal(0, a.ExitCode);
        Assert.Equal(0, b.ExitCode);
        Assert.Equal(File.ReadAllBytes(Path.Combine(dir, "a.csv")), File.ReadAllBytes(Path.Combine(dir, "b.csv")));
        using var reader = VectorReader.Open(Path.Combine(dir, "a.csv"), 6);
        Assert.Equal(string.Join("|", m.Names), string.Join("|", reader.Names));
        var row = new byte[6];
        int rows = 0;
        while (reader.TryRead(row)) rows++;
        Assert.Equal(50, rows);
        var score = CliRunner.Run("score", model, "--input", Path.Combine(dir, "a.csv"));
        Assert.Equal(0, score.ExitCode);
    }

    [Fact]
    public void Count_below_one_is_a_usage_error()
    {
        var model = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(TestModels.Random(ModelKind.Rbm, 3, 2, 1), model, force: true);
        var r = CliRunner.Run("vectors", model, "--count", "0", "-o", "x.csv");
        Assert.Equal(2, r.ExitCode);
    }
}
