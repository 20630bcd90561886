using System.Diagnostics;
using Emit.Model;

namespace Emit.Reference;

/// <summary>Settings of an annealed importance sampling run.</summary>
public sealed record AisOptions(int Chains = 64, int Steps = 2000, ulong Seed = 1);

/// <summary>An AIS estimate of log Z with its standard error (delta method on the mean importance weight).</summary>
public sealed record AisResult(double LogPartition, double Stderr, int Chains, int Steps, double Seconds);

/// <summary>
/// log Z by annealed importance sampling (Neal 2001, "Annealed importance sampling"; the RBM form of
/// Salakhutdinov and Murray 2008, "On the quantitative analysis of deep belief networks"), for models too
/// large to enumerate. The base model has independent visible units with the model's own visible biases;
/// intermediate models are log p*_β = (1−β) b·v + β·(log p* of the model), β rising from 0 to 1 in
/// <see cref="AisOptions.Steps"/> steps (a tenth of them up to 0.5, three tenths up to 0.9, the rest up to 1).
/// For kinds rbm and lateral the hidden units are summed out in closed form; for general the chain's state
/// includes them. Chains run in parallel, each with its own generator seeded from (seed, chain), so the
/// result is the same for any thread count.
/// </summary>
public static class AisLogPartition
{
    /// <summary>Estimates log Z of <paramref name="model"/> with its standard error.</summary>
    public static AisResult Estimate(BoltzmannModel model, AisOptions? options = null,
        CancellationToken cancel = default)
    {
        var o = options ?? new AisOptions();
        if (o.Chains < 2) throw new EmitException("AIS needs at least 2 chains");
        if (o.Steps < 1) throw new EmitException("AIS needs at least 1 step");
        var sw = Stopwatch.StartNew();
        var betas = Schedule(o.Steps);
        var baseBias = model.VisibleBias.ToArray();
        var chain = new GibbsChain(model, baseBias);
        var logWeights = new double[o.Chains];
        Parallel.For(0, o.Chains, new ParallelOptions { CancellationToken = cancel }, c =>
        {
            ulong s = o.Seed ^ ((ulong)c * 0xD1B54A32D192ED03UL);
            var rng = new Xoshiro256(Xoshiro256.SplitMix64(ref s));
            var v = new byte[model.Visible];
            var h = new byte[model.Hidden];
            var u = new double[model.Hidden];
            chain.SampleBase(v, h, rng);
            double lw = 0;
            for (int k = 1; k < betas.Length; k++)
            {
                lw += LogUnnormalised(model, baseBias, v, h, betas[k], u) - LogUnnormalised(model, baseBias, v, h,
                    betas[k - 1], u);
                if (k < betas.Length - 1) chain.Sweep(v, h, betas[k], rng);
            }
            logWeights[c] = lw;
        });
        double logZ0 = model.Hidden * Math.Log(2.0);
        foreach (var b in baseBias) logZ0 += Softplus.Of(b);
        double max = logWeights.Max();
        double mean = logWeights.Average(x => Math.Exp(x - max));
        double var_ = logWeights.Sum(x => Math.Pow(Math.Exp(x - max) - mean, 2)) / (o.Chains - 1);
        double logZ = logZ0 + max + Math.Log(mean);
        double stderr = Math.Sqrt(var_ / o.Chains) / mean;
        return new AisResult(logZ, stderr, o.Chains, o.Steps, sw.Elapsed.TotalSeconds);
    }

    /// <summary>β_0 = 0 &lt; … &lt; β_K = 1.</summary>
    internal static double[] Schedule(int steps)
    {
        int n1 = Math.Max(1, steps / 10), n2 = Math.Max(1, 3 * steps / 10), n3 = Math.Max(1, steps - n1 - n2);
        var b = new List<double> { 0.0 };
        for (int k = 1; k <= n1; k++) b.Add(0.5 * k / n1);
        for (int k = 1; k <= n2; k++) b.Add(0.5 + 0.4 * k / n2);
        for (int k = 1; k <= n3; k++) b.Add(0.9 + 0.1 * k / n3);
        b[^1] = 1.0;
        return b.ToArray();
    }

    /// <summary>
    /// log p*_β of the chain's state: rbm and lateral, of v alone with h summed out,
    /// (1−β) b_A·v + β(b·v + L(v)) + Σ_j softplus(β u_j); general, of (v, h): (1−β) b_A·v − β E(v,h).
    /// </summary>
    private static double LogUnnormalised(BoltzmannModel m, double[] baseBias, byte[] v, byte[] h, double beta,
        double[] u)
    {
        double baseTerm = 0, linear = 0;
        m.HiddenBias.CopyTo(u);
        for (int i = 0; i < m.Visible; i++)
        {
            if (v[i] == 0) continue;
            baseTerm += baseBias[i];
            linear += m.VisibleBias[i];
            var row = m.WeightRow(i);
            for (int j = 0; j < u.Length; j++) u[j] += row[j];
        }
        foreach (var l in m.VisibleLinks) if (v[l.I] != 0 && v[l.J] != 0) linear += l.W;
        double result = (1 - beta) * baseTerm;
        if (m.Kind != ModelKind.General)
        {
            double sp = 0;
            for (int j = 0; j < u.Length; j++) sp += Softplus.Of(beta * u[j]);
            return result + beta * linear + sp;
        }
        double negE = linear;
        for (int j = 0; j < u.Length; j++) if (h[j] != 0) negE += u[j];
        foreach (var l in m.HiddenLinks) if (h[l.I] != 0 && h[l.J] != 0) negE += l.W;
        return result + beta * negE;
    }
}
