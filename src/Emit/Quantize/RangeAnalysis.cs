using System.Collections.Immutable;
using Emit.Model;
using Emit.Reference;

namespace Emit.Quantize;

/// <summary>
/// Ranges of the model's terms over all binary input vectors, in real (double) arithmetic.
/// <list type="bullet">
/// <item>Hidden pre-activation x_j = c_j + Σ_i v_i W_ij: exactly [c_j + Σ_i min(0, W_ij), c_j + Σ_i max(0, W_ij)];
/// both ends are attained (by <see cref="MinimisingVector"/> and <see cref="MaximisingVector"/>), and every partial
/// sum of the accumulation lies inside too, since a partial sum is the pre-activation of another binary vector.</item>
/// <item>Visible bias term b·v: exactly [Σ min(0, b_i), Σ max(0, b_i)].</item>
/// <item>Lateral term Σ_{i&lt;j} L_ij v_i v_j: the enclosure [Σ min(0, L_ij), Σ max(0, L_ij)], which holds every
/// partial sum of any subset of links. (The exact range is a maximum-cut-type problem and is not computed.)</item>
/// <item>Hidden-link term (general) likewise [Σ min(0, M_kl), Σ max(0, M_kl)].</item>
/// <item>Free energy: an enclosure assembled from the above (each part at its own extreme).</item>
/// </list>
/// </summary>
public sealed class RangeAnalysis
{
    private RangeAnalysis(BoltzmannModel model, ImmutableArray<RealRange> hidden, RealRange bias, RealRange lateral,
        RealRange hiddenLinks, RealRange freeEnergy)
    {
        Model = model;
        Hidden = hidden;
        VisibleBiasTerm = bias;
        LateralTerm = lateral;
        HiddenLinkTerm = hiddenLinks;
        FreeEnergy = freeEnergy;
    }

    /// <summary>The analysed model.</summary>
    public BoltzmannModel Model { get; }

    /// <summary>Exact range of each hidden unit's pre-activation.</summary>
    public ImmutableArray<RealRange> Hidden { get; }

    /// <summary>Exact range of b·v.</summary>
    public RealRange VisibleBiasTerm { get; }

    /// <summary>Enclosure of the lateral term and of its partial sums.</summary>
    public RealRange LateralTerm { get; }

    /// <summary>Enclosure of Σ M_kl h_k h_l (kind general; [0, 0] otherwise).</summary>
    public RealRange HiddenLinkTerm { get; }

    /// <summary>Enclosure of F(v) over all binary v.</summary>
    public RealRange FreeEnergy { get; }

    /// <summary>Analyses a model.</summary>
    public static RangeAnalysis Of(BoltzmannModel model)
    {
        int v = model.Visible, h = model.Hidden;
        var lo = new double[h];
        var hi = new double[h];
        for (int j = 0; j < h; j++) lo[j] = hi[j] = model.HiddenBias[j];
        for (int i = 0; i < v; i++)
        {
            var row = model.WeightRow(i);
            for (int j = 0; j < h; j++)
            {
                if (row[j] < 0) lo[j] += row[j];
                else hi[j] += row[j];
            }
        }
        var hidden = Enumerable.Range(0, h).Select(j => new RealRange(lo[j], hi[j])).ToImmutableArray();
        var bias = SignedSums(model.VisibleBias);
        var lateral = SignedSums(model.VisibleLinks.Select(l => l.W));
        var links = SignedSums(model.HiddenLinks.Select(l => l.W));
        var linear = bias + lateral;
        double spLo = 0, spHi = 0;
        foreach (var r in hidden)
        {
            spLo += Softplus.Of(r.Min);
            spHi += Softplus.Of(r.Max);
        }
        // general: Σ_h exp(Σ h_j x_j + Σ M h h) lies between e^{Mmin} and e^{Mmax} times Π_j (1 + e^{x_j}), and
        // the h = 0 term alone gives log-sum-exp ≥ 0.
        RealRange hiddenPart = model.Kind == ModelKind.General
            ? new RealRange(Math.Max(0, spLo + links.Min), spHi + links.Max)
            : new RealRange(spLo, spHi);
        var free = -(linear + hiddenPart);
        return new RangeAnalysis(model, hidden, bias, lateral, links, free);
    }

    /// <summary>The input that attains hidden unit j's largest pre-activation: v_i = 1 where W_ij &gt; 0.</summary>
    public byte[] MaximisingVector(int j) => Column(j, w => w > 0);

    /// <summary>The input that attains hidden unit j's smallest pre-activation: v_i = 1 where W_ij &lt; 0.</summary>
    public byte[] MinimisingVector(int j) => Column(j, w => w < 0);

    private byte[] Column(int j, Func<double, bool> on)
    {
        var u = new byte[Model.Visible];
        for (int i = 0; i < u.Length; i++) u[i] = on(Model.Weight(i, j)) ? (byte)1 : (byte)0;
        return u;
    }

    private static RealRange SignedSums(IEnumerable<double> values)
    {
        double lo = 0, hi = 0;
        foreach (var x in values)
        {
            if (x < 0) lo += x;
            else hi += x;
        }
        return new RealRange(lo, hi);
    }
}
