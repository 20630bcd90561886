using System.Collections.Immutable;
using Emit.Model;

namespace Emit.Tests.Cli;

/// <summary><c>compile MODEL1 MODEL2 ... --name NAME</c>: the files of a classifier, and one-line refusals (exit 2).</summary>
public sealed class ClassifierCliTests
{
    private static string Model(string dir, string file, int seed, double? logZ, int visible = 8,
        ImmutableArray<string> names = default)
    {
        var m = TestModels.Random(ModelKind.Rbm, visible, 3, seed);
        if (!names.IsDefault)
            m = new BoltzmannModel(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, m.Weights, names: names);
        var path = Path.Combine(dir, file);
        ModelJson.WriteFile(m.With(null, logZ is { } z ? new LogPartition(z, "exact", 0) : null), path, force: true);
        return path;
    }

    private static void OneLineError(CliRunner.Result r, string message)
    {
        Assert.Equal(2, r.ExitCode);
        Assert.Contains(message, r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
    }

    [Fact]
    public void Two_models_make_a_classifier_with_one_scorer_each()
    {
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("compile", Model(dir, "idle.json", 1, 9.5), Model(dir, "defrost.json", 2, 8.25),
            "--priors", "0.8,0.2", "--numeric", "fixed", "--target", "c,csharp", "--name", "modes", "--out", dir);
        Assert.True(r.ExitCode == 0, r.Error);
        foreach (var f in new[] { "modes.h", "modes.c", "modes.cs", "modes_1.h", "modes_1.c", "modes_1.emit.json",
                     "modes_2.h", "modes_2.cs", "modes_2.emit.json" })
            Assert.True(File.Exists(Path.Combine(dir, f)), f);
        var h = File.ReadAllText(Path.Combine(dir, "modes.h"));
        Assert.Contains("#define MODES_MODELS 2\n", h);
        Assert.Contains("unsigned modes_classify(const uint8_t packed[MODES_PACKED_BYTES], modes_energy_t scores[MODES_MODELS]);", h);
        Assert.Contains("idle.json", h);
        Assert.Contains("log prior = -0.2231435513142097", h);   // log 0.8
        Assert.Matches(@"#define MODES_SCORE_BOUND \d\.\d+", h);
        // both models in one energy format, recorded in each scorer's manifest
        var e1 = System.Text.RegularExpressions.Regex.Match(File.ReadAllText(Path.Combine(dir, "modes_1.h")), @"MODES_1_ENERGY_FRACTION_BITS (\d+)");
        var e2 = System.Text.RegularExpressions.Regex.Match(File.ReadAllText(Path.Combine(dir, "modes_2.h")), @"MODES_2_ENERGY_FRACTION_BITS (\d+)");
        Assert.Equal(e1.Groups[1].Value, e2.Groups[1].Value);
        Assert.Contains("\"energy_fraction_bits_limit\": " + e1.Groups[1].Value, File.ReadAllText(Path.Combine(dir, "modes_1.emit.json")));
    }

    [Fact]
    public void A_model_without_log_Z_is_refused_with_the_fix()
    {
        var dir = CliRunner.TempDir();
        OneLineError(CliRunner.Run("compile", Model(dir, "a.json", 1, 9.5), Model(dir, "b.json", 2, null), "--name", "m",
            "--out", dir), "emit logz MODEL --store");
    }

    [Fact]
    public void Models_of_other_units_are_refused()
    {
        var dir = CliRunner.TempDir();
        OneLineError(CliRunner.Run("compile", Model(dir, "a.json", 1, 9.5), Model(dir, "b.json", 2, 9, visible: 9),
            "--name", "m", "--out", dir), "b.json has 9 visible units and a.json has 8");
        ImmutableArray<string> names = ["a", "b", "c", "d", "e", "f", "g", "h"], other = ["a", "b", "c", "d", "e", "f", "h", "g"];
        OneLineError(CliRunner.Run("compile", Model(dir, "c.json", 1, 9.5, names: names),
            Model(dir, "d.json", 2, 9, names: other), "--name", "m", "--out", dir), "names its units differently");
    }

    [Fact]
    public void Priors_name_and_counts_are_checked()
    {
        var dir = CliRunner.TempDir();
        string a = Model(dir, "a.json", 1, 9.5), b = Model(dir, "b.json", 2, 9);
        OneLineError(CliRunner.Run("compile", a, b, "--out", dir), "a classifier needs a name");
        OneLineError(CliRunner.Run("compile", a, b, "--priors", "1,2,3", "--name", "m", "--out", dir), "3 priors for 2 models");
        OneLineError(CliRunner.Run("compile", a, b, "--priors", "1,0", "--name", "m", "--out", dir), "positive finite");
        OneLineError(CliRunner.Run("compile", a, "--priors", "1", "--out", dir), "--priors applies to a classifier");
        OneLineError(CliRunner.Run("compile", a, b, "--stream", "--name", "m", "--out", dir),
            "streamed scoring and explanations are for one model, not a classifier");
        OneLineError(CliRunner.Run("compile", a, b, "--explain", "--name", "m", "--out", dir),
            "streamed scoring and explanations are for one model, not a classifier");
    }
}
