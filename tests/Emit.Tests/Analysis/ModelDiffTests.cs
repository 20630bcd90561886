using System.Text;
using System.Text.Json;
using Emit.Analysis;
using Emit.Model;
using Emit.Reference;
using Emit.Tests.Cli;
using Emit.Vectors;

namespace Emit.Tests.Analysis;

/// <summary>
/// <c>emit diff</c> checked against the definition of the free energy: F(v) = −b·v − Σ_{i&lt;j} L_ij v_i v_j −
/// Σ_j softplus(c_j + v·W_j) (Hinton, "A Practical Guide to Training Restricted Boltzmann Machines", 2010, §16.1,
/// with the lateral term of a Boltzmann machine with visible links), so raising one visible bias b_k by δ changes F
/// by exactly −δ·v_k and leaves everything else alone.
/// </summary>
public sealed class ModelDiffTests
{
    private static readonly BoltzmannModel Base = TestModels.Random(ModelKind.Lateral, 12, 5, seed: 21);

    /// <summary>The base model with its threshold at the median free energy of random inputs, so decisions split.</summary>
    private static readonly BoltzmannModel Old = Base.With(threshold: Median(Base), null);

    private static readonly double T = Old.Threshold!.Value;

    private static double Median(BoltzmannModel m)
    {
        var rng = new Random(99);
        var f = Enumerable.Range(0, 1001).Select(_ => new ReferenceScorer(m).FreeEnergy(TestModels.RandomUnits(m.Visible, rng))).Order().ToArray();
        return f[500];
    }

    private static BoltzmannModel WithBias(BoltzmannModel m, int k, double delta) =>
        new(m.Kind, m.Visible, m.Hidden, m.VisibleBias.SetItem(k, m.VisibleBias[k] + delta), m.HiddenBias, m.Weights,
            m.VisibleLinks, m.HiddenLinks, m.Names, m.Threshold, m.LogPartition, m.MetadataJson);

    private static List<byte[]> Vectors(int n, int seed)
    {
        var rng = new Random(seed);
        return Enumerable.Range(0, n).Select(_ => TestModels.RandomUnits(Base.Visible, rng)).ToList();
    }

    private static VectorReader Reader(IEnumerable<byte[]> vectors) =>
        new(new MemoryStream(Encoding.UTF8.GetBytes(string.Concat(vectors.Select(v => string.Join(",", v) + "\n")))), "v.csv", Base.Visible);

    /// <summary>Pearson's r by the two-pass textbook formula.</summary>
    private static double Pearson(double[] x, double[] y)
    {
        double mx = x.Average(), my = y.Average();
        double sxy = x.Zip(y).Sum(p => (p.First - mx) * (p.Second - my));
        return sxy / Math.Sqrt(x.Sum(a => (a - mx) * (a - mx)) * y.Sum(b => (b - my) * (b - my)));
    }

    [Fact]
    public void Raising_one_visible_bias_changes_F_by_minus_delta_where_that_unit_is_on()
    {
        const int k = 4;
        const double delta = 0.75;
        var @new = WithBias(Old, k, delta);
        var vectors = Vectors(5000, 1);
        var r = ModelDiff.Compare(Old, @new, Reader(vectors));

        var on = vectors.Select(v => (double)v[k]).ToArray();
        Assert.Equal(5000, r.Vectors);
        Assert.Equal(-delta * on.Average(), r.MeanDelta, 12);
        Assert.Equal(delta * Math.Sqrt(on.Average()), r.RmsDelta, 12);
        Assert.Equal(delta, r.MaxAbsDelta, 12);
        Assert.Equal(1, vectors[(int)r.MaxAbsDeltaIndex][k]);

        var scorer = new ReferenceScorer(Old);
        var fOld = vectors.Select(v => scorer.FreeEnergy(v)).ToArray();
        var fNew = fOld.Zip(on, (f, u) => f - delta * u).ToArray();
        Assert.Equal(Pearson(fOld, fNew), r.Correlation!.Value, 10);

        // Same threshold: a decision changes exactly where the shift carries F across it.
        var d = r.Decisions!;
        Assert.Equal(fOld.Zip(fNew).Count(p => p.First > T && p.Second > T), d.BothUnusual);
        Assert.Equal(fOld.Zip(fNew).Count(p => p.First <= T && p.Second <= T), d.BothUsual);
        Assert.Equal(0, d.NewlyUnusual);                                                  // F only falls
        Assert.Equal(fOld.Zip(fNew).Count(p => p.First > T && p.Second <= T), d.NoLongerUnusual);
        Assert.True(d.NoLongerUnusual > 0);
        Assert.Equal(Enumerable.Range(0, 5000).Where(i => fOld[i] > T && fNew[i] <= T).Take(ModelDiff.Listed).Select(i => (long)i), d.FirstChanged);
    }

    [Fact]
    public void A_lower_threshold_flags_exactly_the_vectors_between_the_two()
    {
        var vectors = Vectors(3000, 2);
        var fOld = vectors.Select(v => new ReferenceScorer(Old).FreeEnergy(v)).ToArray();
        double lower = T - 1.0;
        var r = ModelDiff.Compare(Old, Old.With(threshold: lower, null), Reader(vectors));
        Assert.Equal(0.0, r.MeanDelta);
        Assert.Equal(0.0, r.MaxAbsDelta);
        Assert.Equal(1.0, r.Correlation!.Value, 12);
        Assert.Equal(fOld.Count(f => f > lower && f <= T), r.Decisions!.NewlyUnusual);
        Assert.True(r.Decisions.NewlyUnusual > 0);
        Assert.Equal(0, r.Decisions.NoLongerUnusual);
    }

    [Fact]
    public void Log_probability_change_follows_from_log_p_equals_minus_F_minus_log_Z()
    {
        var a = Old.With(Old.Threshold, new LogPartition(10.0, "exact", 0));
        var b = WithBias(Old, 0, 0.5).With(Old.Threshold, new LogPartition(10.25, "exact", 0));
        var vectors = Vectors(400, 3);
        var r = ModelDiff.Compare(a, b, Reader(vectors));
        double expected = vectors.Average(v => 0.5 * v[0]) - 0.25; // −ΔF − Δlog Z with ΔF = −0.5 v_0
        Assert.Equal(expected, r.MeanLogProbabilityDelta!.Value, 12);
    }

    [Fact]
    public void Models_of_different_width_and_empty_inputs_are_refused()
    {
        var narrow = TestModels.Random(ModelKind.Rbm, 11, 5, seed: 1);
        Assert.Contains("12 and 11 visible units", Assert.Throws<EmitException>(() => ModelDiff.Compare(Old, narrow, Reader(Vectors(3, 1)))).Problem);
        Assert.Equal("v.csv", Assert.Throws<EmitException>(() => ModelDiff.Compare(Old, Old, Reader([]))).File);
        var noThreshold = ModelDiff.Compare(Old, Old.With(null, null), Reader(Vectors(3, 1)));
        Assert.Null(noThreshold.Decisions);
    }

    [Fact]
    public void The_command_reports_text_and_json_and_fails_on_changed_decisions_only_when_asked()
    {
        var dir = CliRunner.TempDir();
        string oldPath = Path.Combine(dir, "old.json"), newPath = Path.Combine(dir, "new.json"), data = Path.Combine(dir, "v.csv");
        ModelJson.WriteFile(Old, oldPath, force: true);
        ModelJson.WriteFile(WithBias(Old, 4, 0.75), newPath, force: true);
        File.WriteAllText(data, string.Concat(Vectors(500, 4).Select(v => string.Join(",", v) + "\n")));

        var plain = CliRunner.Run("diff", oldPath, newPath, "--input", data, "--report", Path.Combine(dir, "d.json"));
        Assert.True(plain.ExitCode == 0, plain.Error);
        Assert.Contains("no longer unusual", plain.Out);
        Assert.Contains("not a safety function", plain.Out);
        using var json = JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "d.json")));
        Assert.Equal(500, json.RootElement.GetProperty("vectors").GetInt64());
        Assert.Equal(0.75, json.RootElement.GetProperty("free_energy_change").GetProperty("max_abs").GetDouble(), 12);
        Assert.Equal(Old.Sha256, json.RootElement.GetProperty("old").GetProperty("sha256").GetString());

        Assert.Equal(1, CliRunner.Run("diff", oldPath, newPath, "--input", data, "--fail-on-decision-change").ExitCode);
        Assert.Equal(0, CliRunner.Run("diff", oldPath, oldPath, "--input", data, "--fail-on-decision-change").ExitCode);
        ModelJson.WriteFile(Old.With(null, null), newPath, force: true);
        var refused = CliRunner.Run("diff", oldPath, newPath, "--input", data, "--fail-on-decision-change");
        Assert.Equal(2, refused.ExitCode);
        Assert.Contains("needs a threshold in both models", refused.Error);
    }
}
