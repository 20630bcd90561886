using System.Text.Json;
using Emit.Demo;
using Emit.Model;
using Emit.Reference;
using Xunit.Abstractions;

namespace Emit.Tests.Demo;

public sealed class DemoDataTests : IClassFixture<DemoDataFixture>
{
    private readonly DemoDataFixture _fixture;
    private readonly ITestOutputHelper _output;

    public DemoDataTests(DemoDataFixture fixture, ITestOutputHelper output)
    {
        _fixture = fixture;
        _output = output;
    }

    private static string Committed(string name) => Path.Combine(DemoDataFixture.RepositoryRoot(), "demo-data", name);

    // Determinism and freshness: regenerating in a temporary folder gives exactly the committed bytes. When this
    // fails after an intended change to the generator or trainer, bump ReeferFleetGenerator.Version if the
    // scenario changed and regenerate with `dotnet run demo-data/regenerate.cs` (see demo-data/README.md).
    [Fact]
    public void Committed_demo_data_is_what_the_generator_makes_now()
    {
        var temp = Path.Combine(Path.GetTempPath(), "emit-demo-" + Guid.NewGuid().ToString("N"));
        try
        {
            var written = DemoData.Write(_fixture.Data, temp);
            Assert.Equal(4, written.Count);
            long total = 0;
            foreach (var path in written)
            {
                var name = Path.GetFileName(path);
                var expected = File.ReadAllBytes(Committed(name));
                var actual = File.ReadAllBytes(path);
                Assert.True(expected.AsSpan().SequenceEqual(actual),
                    $"demo-data/{name} differs from a fresh regeneration ({expected.Length} vs {actual.Length} bytes); regenerate it");
                total += actual.Length;
            }
            Assert.True(total < 1_000_000, $"demo data is {total} bytes");
        }
        finally
        {
            if (Directory.Exists(temp)) Directory.Delete(temp, recursive: true);
        }
    }

    [Fact]
    public void Committed_model_loads_and_says_how_it_was_made()
    {
        var m = ModelLoader.Load(Committed(DemoData.ModelFileName));
        Assert.Equal(ModelKind.Rbm, m.Kind);
        Assert.Equal(56, m.Visible);
        Assert.Equal(16, m.Hidden);
        Assert.Equal(ReeferFlags.Names.ToArray(), m.Names.ToArray());
        Assert.NotNull(m.Threshold);
        using var meta = JsonDocument.Parse(m.MetadataJson!);
        var root = meta.RootElement;
        Assert.Equal(ReeferFleetGenerator.Version, root.GetProperty("generator").GetProperty("version").GetInt32());
        Assert.Equal(DemoData.Seed, root.GetProperty("generator").GetProperty("seed").GetUInt64());
        var training = root.GetProperty("training");
        Assert.Equal("pcd", training.GetProperty("options").GetProperty("method").GetString());
        Assert.Equal(DemoData.TrainerSettings.Epochs, training.GetProperty("options").GetProperty("epochs").GetInt32());
        Assert.Equal(DemoData.TrainerSeed, training.GetProperty("options").GetProperty("seed").GetUInt64());
        Assert.Equal(DemoData.TrainingRows, training.GetProperty("data").GetProperty("rows").GetInt32());
        Assert.Equal(DemoData.TrainingRows, root.GetProperty("training_rows").GetInt32());
        Assert.Equal(DemoData.ThresholdQuantile, root.GetProperty("threshold").GetProperty("quantile").GetDouble());
        Assert.Contains("not a safety function", root.GetProperty("caution").GetString());

        var header = File.ReadLines(Committed(DemoData.NormalFileName)).First();
        Assert.Equal(string.Join(',', ReeferFlags.Names), header);
        var faults = File.ReadAllLines(Committed(DemoData.FaultsFileName));
        Assert.Equal("index,fault,mode", faults[0]);
        Assert.Equal(DemoData.FaultyRows + 1, faults.Length);
        Assert.Equal(DemoData.FaultyRows + 1, File.ReadAllLines(Committed(DemoData.FaultyFileName)).Length);
    }

    // demo-data/README.md says the model is what
    // `emit train --data training.csv --hidden 16 --epochs 200 --seed SEED` makes of the training rows
    // (regenerate.cs writes them): run the command line on those rows and compare with the committed file.
    [Fact]
    public void Emit_train_with_the_stated_options_makes_the_committed_model()
    {
        var dir = Emit.Tests.Cli.CliRunner.TempDir();
        var t = DemoData.TrainingData();
        var csv = Path.Combine(dir, DemoData.TrainingFileName);
        File.WriteAllText(csv, Emit.Training.TrainingData.Csv(t.Units, t.Width, t.Names));
        var output = Path.Combine(dir, "model.json");
        var r = Emit.Tests.Cli.CliRunner.Run("train", "--data", csv, "--hidden", "16", "--epochs", "200", "--seed", DemoData.TrainerSeed.ToString(System.Globalization.CultureInfo.InvariantCulture), "-o", output);
        Assert.True(r.ExitCode == 0, r.Error);
        var trained = ModelJson.Read(output);
        var committed = ModelJson.Read(Committed(DemoData.ModelFileName));
        Assert.Equal(committed.Weights.ToArray(), trained.Weights.ToArray());
        Assert.Equal(committed.VisibleBias.ToArray(), trained.VisibleBias.ToArray());
        Assert.Equal(committed.HiddenBias.ToArray(), trained.HiddenBias.ToArray());
        using var a = JsonDocument.Parse(trained.MetadataJson!);
        using var b = JsonDocument.Parse(committed.MetadataJson!);
        Assert.Equal(b.RootElement.GetProperty("training").GetRawText(), a.RootElement.GetProperty("training").GetRawText());
    }

    // A demo property, not a guarantee of the method: on this invented scenario the trained model separates the
    // faulty reports from the normal ones (scored by the reference scorer against the model's own threshold).
    // The normal reports are a fresh sample, neither trained nor calibrated on, so about 0.5% should be flagged.
    [Fact]
    public void Demo_model_flags_most_faults_and_few_normal_reports()
    {
        var data = _fixture.Data;
        var scorer = new ReferenceScorer(data.Model);
        double t = data.Model.Threshold!.Value;
        double normalFlagged = data.Normal.Count(r => scorer.FreeEnergy(r.Flags.AsSpan()) > t) / (double)data.Normal.Length;
        double faultyFlagged = data.Faulty.Count(r => scorer.FreeEnergy(r.Flags.AsSpan()) > t) / (double)data.Faulty.Length;
        _output.WriteLine($"threshold {t}; normal flagged {normalFlagged:P2} of {data.Normal.Length}; faulty flagged {faultyFlagged:P2} of {data.Faulty.Length}");
        var perFault = new Dictionary<string, double>();
        foreach (var g in data.Faulty.GroupBy(r => r.Fault!).OrderBy(g => g.Key, StringComparer.Ordinal))
        {
            int hit = g.Count(r => scorer.FreeEnergy(r.Flags.AsSpan()) > t);
            perFault[g.Key] = hit / (double)g.Count();
            _output.WriteLine($"  {g.Key}: {hit}/{g.Count()} = {perFault[g.Key]:P1}");
        }
        foreach (var g in data.Normal.GroupBy(r => r.Mode).OrderBy(g => g.Key, StringComparer.Ordinal))
            _output.WriteLine($"  normal {g.Key}: {g.Count(r => scorer.FreeEnergy(r.Flags.AsSpan()) > t)}/{g.Count()}");

        Assert.True(normalFlagged <= 0.015, $"normal flagged {normalFlagged:P2}");
        Assert.True(faultyFlagged >= 0.6, $"faulty flagged {faultyFlagged:P2}");
        foreach (var blatant in new[] { "evaporator_fan_failure", "condenser_fan_failure", "defrost_stuck" })
            Assert.True(perFault[blatant] >= 0.85, $"{blatant}: {perFault[blatant]:P1}");
    }
}
