using Emit.Tests.Reference;
using System.Globalization;
using Emit.Analysis;
using Emit.Quantize;
using Emit.Model;
using Emit.Reference;
using Emit.Tests.Cli;

namespace Emit.Tests.Analysis;

/// <summary>
/// Bayes' rule across models, P(k | v) = π_k p_k(v) / Σ_m π_m p_m(v), checked against probabilities computed by brute
/// force from the energy definition: p_k(v) = Σ_h exp(−E_k(v,h)) / Σ_{v,h} exp(−E_k(v,h)) (see BruteForce).
/// </summary>
public sealed class BayesClassifierTests
{
    private static readonly BoltzmannModel[] Models =
    [
        Stored(TestModels.Random(ModelKind.Rbm, 5, 3, seed: 31, scale: 1.2)),
        Stored(TestModels.Random(ModelKind.Lateral, 5, 2, seed: 32, scale: 1.2)),
        Stored(TestModels.Random(ModelKind.General, 5, 3, seed: 33, scale: 1.2)),
    ];

    private static BoltzmannModel Stored(BoltzmannModel m) => m.With(null, new LogPartition(ExactLogPartition.Compute(m).LogPartition, "exact", 0));

    private static double[] Expected(byte[] v, double[] priors)
    {
        var joint = Models.Select((m, k) => priors[k] * Math.Exp(-BruteForce.FreeEnergy(m, v) - BruteForce.LogPartition(m))).ToArray();
        return joint.Select(j => j / joint.Sum()).ToArray();
    }

    [Theory]
    [InlineData(1.0, 1.0, 1.0)]
    [InlineData(0.7, 0.2, 0.1)]
    [InlineData(5.0, 1.0, 1e-6)]
    public void Posteriors_match_brute_force_over_every_input(double p0, double p1, double p2)
    {
        double[] priors = [p0, p1, p2];
        var classifier = new BayesClassifier(Models, ["a", "b", "c"], priors);
        var units = Enumerable.Range(0, 32).SelectMany(b => TestModels.Bits(b, 5)).ToArray();
        var post = new double[32 * 3];
        classifier.Posteriors(units, 32, post);
        for (int b = 0; b < 32; b++)
        {
            var expected = Expected(TestModels.Bits(b, 5), priors.Select(p => p / priors.Sum()).ToArray());
            for (int k = 0; k < 3; k++) Assert.Equal(expected[k], post[b * 3 + k], 12);
        }
    }

    [Theory]
    [InlineData(1e308, 1e308, 1e308, 1.0, 1.0, 1.0)]        // Σ w overflows double: the old plain sum gave NaN
    [InlineData(1e308, 1e308, 1e292, 1.0, 1.0, 1e-16)]
    [InlineData(1e-320, 1e-320, 2e-320, 1.0, 1.0, 2.0)]     // subnormal weights
    public void Priors_are_normalised_in_log_space(double w0, double w1, double w2, double r0, double r1, double r2)
    {
        // (r0, r1, r2) are the same relative weights at an ordinary scale; the posteriors must not depend on the scale.
        var classifier = new BayesClassifier(Models, ["a", "b", "c"], [w0, w1, w2]);
        var units = Enumerable.Range(0, 32).SelectMany(b => TestModels.Bits(b, 5)).ToArray();
        var post = new double[32 * 3];
        classifier.Posteriors(units, 32, post);
        double sum = r0 + r1 + r2;
        for (int b = 0; b < 32; b++)
        {
            var expected = Expected(TestModels.Bits(b, 5), [r0 / sum, r1 / sum, r2 / sum]);
            for (int k = 0; k < 3; k++) Assert.Equal(expected[k], post[b * 3 + k], 10);
        }
    }

    [Fact]
    public void A_vector_whose_free_energy_overflows_double_is_refused_not_given_NaN_posteriors()
    {
        // W = 1e308 on both units: with both on the pre-activation is 2e308 = ∞ in double (IEEE 754 binary64 max
        // ≈ 1.8e308), F = −∞ and every posterior of that row would be ∞ − ∞ = NaN.
        var huge = new BoltzmannModel(ModelKind.Rbm, 2, 1, [0.0, 0.0], [0.0], [1e308, 1e308], [], [])
            .With(null, new LogPartition(1.0, "exact", 0));
        var small = new BoltzmannModel(ModelKind.Rbm, 2, 1, [0.0, 0.0], [0.0], [0.1, 0.2], [], [])
            .With(null, new LogPartition(1.0, "exact", 0));
        var classifier = new BayesClassifier([huge, small], ["huge", "small"]);
        var post = new double[4];
        classifier.Posteriors([0, 0], 1, post);
        Assert.Equal(0.5, post[0] + post[1] - 0.5, 12);
        var e = Assert.Throws<EmitException>(() => classifier.Posteriors([0, 0, 1, 1], 2, post, firstIndex: 10));
        Assert.Contains("vector 11", e.Problem);
    }

    [Fact]
    public void Refuses_models_it_cannot_compare()
    {
        var noZ = TestModels.Random(ModelKind.Rbm, 5, 3, seed: 1);
        Assert.Contains("no log_partition", Assert.Throws<EmitException>(() => new BayesClassifier([Models[0], noZ], ["a", "b.json"])).Problem);
        var wide = Stored(TestModels.Random(ModelKind.Rbm, 6, 2, seed: 1));
        Assert.Equal("b.json", Assert.Throws<EmitException>(() => new BayesClassifier([Models[0], wide], ["a", "b.json"])).File);
        Assert.Throws<EmitException>(() => new BayesClassifier([Models[0]], ["a"]));
        Assert.Throws<EmitException>(() => new BayesClassifier(Models, ["a", "b", "c"], [1.0, 2.0]));
        Assert.Throws<EmitException>(() => new BayesClassifier(Models, ["a", "b", "c"], [1.0, 0.0, 1.0]));
        Assert.Throws<EmitException>(() => new BayesClassifier(Models, ["a", "b", "c"], [1.0, double.NaN, 1.0]));
    }

    [Fact]
    public void The_command_writes_one_row_per_vector_with_the_best_class()
    {
        var dir = CliRunner.TempDir();
        var paths = new[] { "idle.json", "defrost.json", "idle.json" }.Select((n, k) => Path.Combine(dir, k == 2 ? "sub" : "", n)).ToArray();
        Directory.CreateDirectory(Path.Combine(dir, "sub"));
        for (int k = 0; k < 3; k++) ModelJson.WriteFile(Models[k], paths[k], force: true);
        var data = Path.Combine(dir, "v.csv");
        File.WriteAllText(data, "0,0,0,0,0\n1,1,0,1,0\n1,1,1,1,1\n");
        var r = CliRunner.Run(["classify", .. paths, "--input", data, "--priors", "2,1,1"]);
        Assert.True(r.ExitCode == 0, r.Error);
        var lines = r.Out.TrimEnd('\n').Split('\n');
        Assert.Equal("index,best,p_idle,p_defrost,p_idle_2", lines[0]);
        Assert.Equal(4, lines.Length);
        var rows = new[] { new byte[] { 0, 0, 0, 0, 0 }, [1, 1, 0, 1, 0], [1, 1, 1, 1, 1] };
        string[] labels = ["idle", "defrost", "idle_2"];
        for (int i = 0; i < 3; i++)
        {
            var cells = lines[i + 1].Split(',');
            var expected = Expected(rows[i], [0.5, 0.25, 0.25]);
            Assert.Equal(labels[Array.IndexOf(expected, expected.Max())], cells[1]);
            for (int k = 0; k < 3; k++) Assert.Equal(expected[k], double.Parse(cells[2 + k], CultureInfo.InvariantCulture), 12);
        }
        var csv = Path.Combine(dir, "posteriors.csv");
        var toFile = CliRunner.Run(["classify", .. paths, "--input", data, "--priors", "2,1,1", "--output", csv]);
        Assert.True(toFile.ExitCode == 0, toFile.Error);
        Assert.Equal(r.Out, File.ReadAllText(csv));
        Assert.Equal("", toFile.Out);
        Assert.Equal(2, CliRunner.Run("classify", paths[0], "--input", data).ExitCode);                  // one model
        Assert.Equal(2, CliRunner.Run(["classify", .. paths, "--input", data, "--priors", "1,x,1"]).ExitCode);
    }
}
