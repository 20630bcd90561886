using Emit.Model;
using Emit.Reference;

namespace Emit.Detection;

/// <summary>
/// Why a vector is unusual: for each visible unit i, ΔF_i = F(v with unit i flipped) − F(v). The most negative ΔF
/// are the flags that look most out of place (setting them the other way makes the report most ordinary).
/// With s = +1 when unit i turns on and −1 when it turns off, and a_j = c_j + Σ_k v_k W_kj the hidden fields of v:
/// <list type="bullet">
/// <item>rbm and lateral: ΔF_i = −s (b_i + Σ_{k≠i} L_ik v_k) − Σ_j [softplus(a_j + s W_ij) − softplus(a_j)],
/// O(hidden + links of i) per unit after one O(visible · hidden) pass for a.</item>
/// <item>general: the visible part as above; the hidden part is the exact log-sum over all 2^hidden hidden states
/// with fields a + s W_i, O(2^hidden · hidden) per unit (hidden ≤
/// <see cref="ReferenceScorer.MaxGeneralHidden"/>).</item>
/// </list>
/// Thread-safe.
/// </summary>
public sealed class UnitFlipExplainer
{
    private readonly BoltzmannModel _model;
    private readonly double[] _w;
    private readonly (int Other, double W)[][] _neighbours;
    private readonly double[]? _hiddenPairs;

    /// <summary>An explainer for <paramref name="model"/> (its hidden layer summed out once per call).</summary>
    public UnitFlipExplainer(BoltzmannModel model)
    {
        ArgumentNullException.ThrowIfNull(model);
        _model = model;
        _w = model.Weights.ToArray();
        var lists = new List<(int, double)>?[model.Visible];
        foreach (var l in model.VisibleLinks)
        {
            (lists[l.I] ??= []).Add((l.J, l.W));
            (lists[l.J] ??= []).Add((l.I, l.W));
        }
        _neighbours = lists.Select(x => x?.ToArray() ?? []).ToArray();
        if (model.Kind == ModelKind.General)
        {
            if (model.Hidden > ReferenceScorer.MaxGeneralHidden)
                throw new EmitException($"a general model's free energy sums over 2^{model.Hidden} hidden states",
                    $"explanations allow hidden <= {ReferenceScorer.MaxGeneralHidden} for kind general");
            int h = model.Hidden;
            _hiddenPairs = new double[h * h];
            foreach (var l in model.HiddenLinks)
            {
                _hiddenPairs[l.I * h + l.J] = l.W;
                _hiddenPairs[l.J * h + l.I] = l.W;
            }
        }
    }

    /// <summary>The model explained.</summary>
    public BoltzmannModel Model => _model;

    /// <summary>ΔF_i for every visible unit of <paramref name="units"/> (one byte per unit, nonzero = on).</summary>
    public double[] Deltas(ReadOnlySpan<byte> units)
    {
        int v = _model.Visible, h = _model.Hidden;
        if (units.Length != v) throw new EmitException($"expected {v} units, got {units.Length}");
        var a = _model.HiddenBias.ToArray();
        for (int i = 0; i < v; i++)
            if (units[i] != 0)
                for (int j = 0; j < h; j++) a[j] += _w[i * h + j];
        double hiddenNow = _hiddenPairs is null ? 0 : HiddenLogSum(a);
        var deltas = new double[v];
        var shifted = _hiddenPairs is null ? null : new double[h];
        for (int i = 0; i < v; i++)
        {
            double s = units[i] != 0 ? -1 : 1;
            double field = _model.VisibleBias[i];
            foreach (var (other, w) in _neighbours[i])
                if (units[other] != 0) field += w;
            double delta = -s * field;
            var row = _w.AsSpan(i * h, h);
            if (shifted is null)
            {
                for (int j = 0; j < h; j++) delta -= Softplus.Of(a[j] + s * row[j]) - Softplus.Of(a[j]);
            }
            else
            {
                for (int j = 0; j < h; j++) shifted[j] = a[j] + s * row[j];
                delta -= HiddenLogSum(shifted) - hiddenNow;
            }
            deltas[i] = delta;
        }
        return deltas;
    }

    /// <summary>
    /// The <paramref name="top"/> units with the most negative ΔF, most negative first (ties: lower unit first).
    /// </summary>
    public IReadOnlyList<UnitFlip> Top(ReadOnlySpan<byte> units, int top)
    {
        if (top < 1) throw new EmitException($"top = {top} is less than 1");
        var d = Deltas(units);
        return Enumerable.Range(0, d.Length).OrderBy(i => d[i]).ThenBy(i => i).Take(top)
            .Select(i => new UnitFlip(i, d[i])).ToList();
    }

    private double HiddenLogSum(double[] fields) =>
        new GrayCodeSum((double[])fields.Clone(), _hiddenPairs, [], []).LogSumExp(parallel: false);
}
