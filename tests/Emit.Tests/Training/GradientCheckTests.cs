using System.Collections.Immutable;
using Emit.Model;
using Emit.Tests.Reference;
using Emit.Training;

namespace Emit.Tests.Training;

/// <summary>
/// The trainer's two phases against exact expectations of tiny models (at most 10 units), computed here by
/// enumerating every joint state with the energy written out from its definition (<see cref="BruteForce"/>):
/// p(v, h) = exp(-E(v, h)) / Z (Ackley, Hinton and Sejnowski 1985). The gradient of the mean log-likelihood is
/// "data statistics minus model statistics", so a trainer whose positive statistics equal the exact conditional
/// expectations and whose negative chains average to the exact model expectations follows that gradient.
/// </summary>
public sealed class GradientCheckTests
{
    public static TheoryData<ModelKind, int, int> Kinds => new()
    {
        { ModelKind.Rbm, 6, 4 },
        { ModelKind.Lateral, 6, 3 },
        { ModelKind.General, 5, 4 },
    };

    private static TrainingRun Run(BoltzmannModel model, int chains, ulong seed)
    {
        var rows = Enumerable.Range(0, chains).Select(r => TestModels.Bits(r * 7 + 3, model.Visible).ToImmutableArray()).ToList();
        var data = TrainingData.FromRows(rows, default, "tiny");
        return TrainingRun.ForModel(model, data, new TrainerSettings { BatchSize = chains, Seed = seed });
    }

    /// <summary>Exact E[h_j | v] and E[h_k h_l | v] by enumerating h with the brute-force energy.</summary>
    private static (double[] H, double[,] HH) ExactPosterior(BoltzmannModel m, byte[] v)
    {
        int nh = m.Hidden;
        var weights = new double[1 << nh];
        for (int g = 0; g < weights.Length; g++) weights[g] = BruteForce.NegativeEnergy(m, v, TestModels.Bits(g, nh));
        double max = weights.Max(), total = 0;
        for (int g = 0; g < weights.Length; g++) total += weights[g] = Math.Exp(weights[g] - max);
        var h = new double[nh];
        var hh = new double[nh, nh];
        for (int g = 0; g < weights.Length; g++)
        {
            var bits = TestModels.Bits(g, nh);
            for (int k = 0; k < nh; k++)
            {
                h[k] += bits[k] * weights[g] / total;
                for (int l = 0; l < nh; l++) hh[k, l] += bits[k] * bits[l] * weights[g] / total;
            }
        }
        return (h, hh);
    }

    [Theory]
    [MemberData(nameof(Kinds))]
    public void Positive_statistics_equal_the_exact_posterior_expectations(ModelKind kind, int visible, int hidden)
    {
        var model = TestModels.Random(kind, visible, hidden, seed: 40 + visible, scale: 0.8, linkDensity: 0.6);
        var run = Run(model, 1, 1);
        var ph = new double[hidden];
        var hh = new double[hidden * hidden];
        for (int bits = 0; bits < 1 << visible; bits++)
        {
            var v = TestModels.Bits(bits, visible);
            run.PositiveStatistics(v, ph, hh);
            var (h, exactHH) = ExactPosterior(model, v);
            for (int k = 0; k < hidden; k++)
            {
                Assert.True(Math.Abs(ph[k] - h[k]) <= 1e-12, $"{kind} v={bits} E[h{k}]: {ph[k]:R} vs exact {h[k]:R}");
                if (kind == ModelKind.General)
                    for (int l = 0; l < hidden; l++)
                        if (l != k)
                            Assert.True(Math.Abs(hh[k * hidden + l] - exactHH[k, l]) <= 1e-12, $"E[h{k} h{l}] v={bits}: {hh[k * hidden + l]:R} vs {exactHH[k, l]:R}");
            }
        }
    }

    /// <summary>
    /// Long-run averages of the persistent chains against the exact model expectations E[v_i h_j], E[v_i v_j] and
    /// E[h_k h_l]. Standard errors by batch means (Flegal and Jones, "Batch means and spectral variance estimators in
    /// Markov chain Monte Carlo", Annals of Statistics 38, 2010): 50 consecutive batches of sweeps, each the average over
    /// all chains; SE = sd(batch averages) / sqrt(50). Batches of 400 sweeps are far longer than these tiny chains'
    /// autocorrelation, so the batch averages are close to independent. Every statistic must lie within 4 SE (a
    /// deterministic seed; about 1 in 16 000 per statistic if the sampler were exact and the errors normal).
    /// </summary>
    [Theory]
    [MemberData(nameof(Kinds))]
    public void Negative_chains_average_to_the_exact_model_expectations(ModelKind kind, int visible, int hidden)
    {
        var model = TestModels.Random(kind, visible, hidden, seed: 70 + visible, scale: 0.7, linkDensity: 0.6);
        int n = visible + hidden;
        Assert.True(n <= 10);
        // Exact moments of the joint units s = (v, h).
        var exact = new double[n, n];
        var states = new List<(byte[] S, double LogW)>();
        for (int vb = 0; vb < 1 << visible; vb++)
            for (int hb = 0; hb < 1 << hidden; hb++)
            {
                var v = TestModels.Bits(vb, visible);
                var h = TestModels.Bits(hb, hidden);
                states.Add((v.Concat(h).ToArray(), BruteForce.NegativeEnergy(model, v, h)));
            }
        double max = states.Max(s => s.LogW), z = states.Sum(s => Math.Exp(s.LogW - max));
        foreach (var (s, logW) in states)
        {
            double p = Math.Exp(logW - max) / z;
            for (int a = 0; a < n; a++)
                for (int b = 0; b < n; b++) exact[a, b] += s[a] * s[b] * p;
        }

        const int chains = 8, batches = 50, sweepsPerBatch = 400, burnIn = 200;
        var run = Run(model, chains, 99);
        var stat = new double[hidden];
        var batchMeans = new double[batches, n, n];
        for (int t = 0; t < burnIn; t++)
            for (int k = 0; k < chains; k++) run.ChainStep(k, stat);
        for (int batch = 0; batch < batches; batch++)
            for (int t = 0; t < sweepsPerBatch; t++)
                for (int k = 0; k < chains; k++)
                {
                    var v = run.ChainStep(k, stat).ToArray();
                    var s = new double[n];
                    for (int i = 0; i < visible; i++) s[i] = v[i];
                    for (int j = 0; j < hidden; j++) s[visible + j] = stat[j];
                    for (int a = 0; a < n; a++)
                        for (int b = a + 1; b < n; b++)
                        {
                            bool hiddenPair = a >= visible;
                            // h_k h_l needs samples (a product of two probabilities is not E[h_k h_l | v]); for
                            // kind general the statistic already is the sample.
                            double x = hiddenPair && kind != ModelKind.General ? run.ChainHidden(k)[a - visible] * run.ChainHidden(k)[b - visible] : s[a] * s[b];
                            batchMeans[batch, a, b] += x / (sweepsPerBatch * chains);
                        }
                }
        int checkedCount = 0;
        for (int a = 0; a < n; a++)
            for (int b = a + 1; b < n; b++)
            {
                bool vv = b < visible, hh = a >= visible;
                if (vv && kind == ModelKind.Rbm) continue;   // no visible links to learn, but check anyway below
                if (hh && kind != ModelKind.General) continue;
                double mean = 0;
                for (int k = 0; k < batches; k++) mean += batchMeans[k, a, b] / batches;
                double var = 0;
                for (int k = 0; k < batches; k++) var += Math.Pow(batchMeans[k, a, b] - mean, 2) / (batches - 1);
                double se = Math.Sqrt(var / batches);
                Assert.True(se > 0, $"{kind} ({a},{b}): zero variance");
                Assert.True(Math.Abs(mean - exact[a, b]) <= 4 * se,
                    $"{kind} s{a} s{b}: chains {mean:F5} vs exact {exact[a, b]:F5}, {Math.Abs(mean - exact[a, b]) / se:F1} standard errors");
                checkedCount++;
            }
        Assert.True(checkedCount >= visible * hidden);
    }
}
