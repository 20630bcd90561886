using Emit.Model;

namespace Emit.Reference;

/// <summary>
/// Gibbs sampling for a Boltzmann machine at inverse temperature β, annealed from a base model of independent
/// visible units with biases b_A: log p*_β(v,h) = (1−β) b_A·v − β E(v,h). β = 1 samples the model itself.
/// One sweep updates every hidden unit, then every visible unit, each from its exact conditional given all
/// others (block updates for a layer without lateral links, which is the same thing). The sweep leaves p_β
/// invariant.
/// </summary>
public sealed class GibbsChain
{
    private readonly BoltzmannModel _m;
    private readonly double[] _baseBias;
    private readonly (int Other, double W)[][] _vLinks;
    private readonly (int Other, double W)[][] _hLinks;
    private readonly double[] _w;

    /// <summary>
    /// A chain for <paramref name="model"/>; <paramref name="baseBias"/> is b_A of the base model (default: the model's
    /// visible biases).
    /// </summary>
    public GibbsChain(BoltzmannModel model, double[]? baseBias = null)
    {
        _m = model;
        _baseBias = baseBias ?? model.VisibleBias.ToArray();
        _w = model.Weights.ToArray();
        _vLinks = Neighbours(model.Visible, model.VisibleLinks);
        _hLinks = Neighbours(model.Hidden, model.HiddenLinks);
    }

    private static (int, double)[][] Neighbours(int n, IEnumerable<Link> links)
    {
        var lists = Enumerable.Range(0, n).Select(_ => new List<(int, double)>()).ToArray();
        foreach (var l in links) { lists[l.I].Add((l.J, l.W)); lists[l.J].Add((l.I, l.W)); }
        return lists.Select(x => x.ToArray()).ToArray();
    }

    /// <summary>The base biases b_A (visible units independent at β = 0).</summary>
    public ReadOnlySpan<double> BaseBias => _baseBias;

    /// <summary>Draws v from the base model (β = 0) and h uniformly.</summary>
    public void SampleBase(Span<byte> v, Span<byte> h, Xoshiro256 rng)
    {
        for (int i = 0; i < v.Length; i++) v[i] = rng.Bernoulli(_baseBias[i]) ? (byte)1 : (byte)0;
        for (int j = 0; j < h.Length; j++) h[j] = (byte)(rng.NextUInt64() >> 63);
    }

    /// <summary>One sweep at inverse temperature <paramref name="beta"/>: hidden units, then visible units.</summary>
    public void Sweep(Span<byte> v, Span<byte> h, double beta, Xoshiro256 rng)
    {
        int nv = _m.Visible, nh = _m.Hidden;
        Span<double> u = nh <= 1024 ? stackalloc double[nh] : new double[nh];
        _m.HiddenBias.AsSpan().CopyTo(u);
        for (int i = 0; i < nv; i++)
        {
            if (v[i] == 0) continue;
            var row = _w.AsSpan(i * nh, nh);
            for (int j = 0; j < nh; j++) u[j] += row[j];
        }
        for (int j = 0; j < nh; j++)
        {
            double field = u[j];
            foreach (var (k, w) in _hLinks[j]) if (h[k] != 0) field += w;
            h[j] = rng.Bernoulli(beta * field) ? (byte)1 : (byte)0;
        }
        for (int i = 0; i < nv; i++)
        {
            double field = _m.VisibleBias[i];
            var row = _w.AsSpan(i * nh, nh);
            for (int j = 0; j < nh; j++) if (h[j] != 0) field += row[j];
            foreach (var (k, w) in _vLinks[i]) if (v[k] != 0) field += w;
            v[i] = rng.Bernoulli((1 - beta) * _baseBias[i] + beta * field) ? (byte)1 : (byte)0;
        }
    }
}
