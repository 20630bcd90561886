using System.Collections.Immutable;
using Emit.Model;

namespace Emit.Demo;

/// <summary>
/// A small deterministic trainer for binary RBMs by contrastive divergence (CD-k; Hinton, "Training products of
/// experts by minimizing contrastive divergence", Neural Computation 14(8), 2002; mini-batch, momentum and
/// weight decay as in Hinton, "A practical guide to training restricted Boltzmann machines", UTML TR 2010-003).
/// Single-threaded, a fixed order of every floating-point operation, a SplitMix64 stream and
/// <see cref="DemoMath"/> instead of the platform's exp: the same rows and settings give the same bits everywhere.
/// Made for the demo model, not for large data.
/// </summary>
public static class RbmTrainer
{
    /// <summary>Trains a kind-rbm model on 0/1 rows (each of length names.Length).</summary>
    public static RbmTrainingResult Train(IReadOnlyList<ImmutableArray<byte>> rows, ImmutableArray<string> names, RbmTrainerSettings settings)
    {
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(settings);
        int nv = names.Length, nh = settings.Hidden;
        if (rows.Count == 0) throw new ArgumentException("no training rows", nameof(rows));
        if (nv < 1 || nh < 1) throw new ArgumentException("need at least one visible and one hidden unit");
        if (settings.BatchSize < 1 || settings.Epochs < 0 || settings.CdSteps < 1)
            throw new ArgumentException("batch size and CD steps must be positive, epochs not negative", nameof(settings));
        foreach (var r in rows)
            if (r.Length != nv) throw new ArgumentException($"a row has {r.Length} values, expected {nv}", nameof(rows));
        // Plain arrays in the loops below: indexing them stays cheap even in unoptimised (Debug) builds.
        var data = rows.Select(r => r.ToArray()).ToArray();

        var rng = new SplitMix64(settings.Seed);
        var w = new double[nv * nh];
        var b = new double[nv];
        var c = new double[nh];
        for (int k = 0; k < w.Length; k++) w[k] = (2 * rng.NextDouble() - 1) * settings.InitialWeightScale;
        // Visible biases start at the log-odds of each unit's frequency, clipped away from 0 and 1 (practical guide, section 8).
        for (int i = 0; i < nv; i++)
        {
            int on = 0;
            foreach (var r in data) on += r[i];
            double p = Math.Clamp((double)on / rows.Count, 0.001, 0.999);
            b[i] = DemoMath.Log(p / (1 - p));
        }

        var dw = new double[w.Length];
        var db = new double[nv];
        var dc = new double[nh];
        var gw = new double[w.Length];
        var gb = new double[nv];
        var gc = new double[nh];
        var ph0 = new double[nh];
        var h = new byte[nh];
        var pv = new double[nv];
        var vk = new byte[nv];
        var phk = new double[nh];
        var onScratch = new int[nh];
        var order = Enumerable.Range(0, rows.Count).ToArray();
        var errors = ImmutableArray.CreateBuilder<double>(settings.Epochs);

        for (int epoch = 0; epoch < settings.Epochs; epoch++)
        {
            double momentum = epoch < settings.MomentumSwitchEpoch ? settings.InitialMomentum : settings.FinalMomentum;
            for (int k = order.Length - 1; k > 0; k--) // Fisher-Yates shuffle
            {
                int j = rng.NextBelow(k + 1);
                (order[k], order[j]) = (order[j], order[k]);
            }
            double error = 0;
            for (int start = 0; start < order.Length; start += settings.BatchSize)
            {
                int end = Math.Min(start + settings.BatchSize, order.Length);
                Array.Clear(gw); Array.Clear(gb); Array.Clear(gc);
                for (int n = start; n < end; n++)
                {
                    var v0 = data[order[n]];
                    HiddenProbabilities(v0, w, c, nh, ph0);
                    Sample(ph0, h, rng);
                    for (int step = 1; ; step++)
                    {
                        VisibleProbabilities(h, w, b, nh, pv, onScratch);
                        Sample(pv, vk, rng);
                        HiddenProbabilities(vk, w, c, nh, phk);
                        if (step == settings.CdSteps) break;
                        Sample(phk, h, rng);
                    }
                    for (int i = 0; i < nv; i++)
                    {
                        double d = v0[i] - pv[i];
                        error += d * d;
                    }
                    // Positive statistics v0 ph0, negative vk phk (hidden probabilities reduce sampling noise; practical guide 3.3).
                    for (int i = 0; i < nv; i++)
                    {
                        int at = i * nh;
                        if (v0[i] != 0)
                            for (int j = 0; j < nh; j++) gw[at + j] += ph0[j];
                        if (vk[i] != 0)
                            for (int j = 0; j < nh; j++) gw[at + j] -= phk[j];
                        gb[i] += v0[i] - vk[i];
                    }
                    for (int j = 0; j < nh; j++) gc[j] += ph0[j] - phk[j];
                }
                double scale = settings.LearningRate / (end - start);
                for (int k = 0; k < w.Length; k++)
                {
                    dw[k] = momentum * dw[k] + (scale * gw[k] - settings.LearningRate * settings.WeightDecay * w[k]);
                    w[k] += dw[k];
                }
                for (int i = 0; i < nv; i++) { db[i] = momentum * db[i] + scale * gb[i]; b[i] += db[i]; }
                for (int j = 0; j < nh; j++) { dc[j] = momentum * dc[j] + scale * gc[j]; c[j] += dc[j]; }
            }
            errors.Add(error / ((double)order.Length * nv));
        }

        var model = new BoltzmannModel(ModelKind.Rbm, nv, nh,
            ImmutableArray.Create(b), ImmutableArray.Create(c), ImmutableArray.Create(w), names: names);
        return new RbmTrainingResult(model, errors.MoveToImmutable());
    }

    /// <summary>p(h_j = 1 | v) = sigmoid(c_j + Σ_i v_i W_ij).</summary>
    private static void HiddenProbabilities(byte[] v, double[] w, double[] c, int nh, double[] ph)
    {
        Array.Copy(c, ph, nh);
        for (int i = 0; i < v.Length; i++)
        {
            if (v[i] == 0) continue;
            int at = i * nh;
            for (int j = 0; j < nh; j++) ph[j] += w[at + j];
        }
        for (int j = 0; j < nh; j++) ph[j] = DemoMath.Sigmoid(ph[j]);
    }

    /// <summary>p(v_i = 1 | h) = sigmoid(b_i + Σ_j W_ij h_j).</summary>
    private static void VisibleProbabilities(byte[] h, double[] w, double[] b, int nh, double[] pv, int[] on)
    {
        int count = 0;
        for (int j = 0; j < nh; j++)
            if (h[j] != 0) on[count++] = j;
        for (int i = 0; i < pv.Length; i++)
        {
            double x = b[i];
            int at = i * nh;
            for (int k = 0; k < count; k++) x += w[at + on[k]];
            pv[i] = DemoMath.Sigmoid(x);
        }
    }

    private static void Sample(double[] p, byte[] s, SplitMix64 rng)
    {
        for (int k = 0; k < p.Length; k++) s[k] = rng.NextDouble() < p[k] ? (byte)1 : (byte)0;
    }
}
