using System.Numerics;
using Emit.Model;

namespace Emit.Reference;

/// <summary>
/// The double-precision free energy F(v) = −log Σ_h exp(−E(v,h)) that all generated code is judged against.
/// rbm and lateral: F(v) = −b·v − Σ_{i&lt;j} L_ij v_i v_j − Σ_j softplus(c_j + Σ_i v_i W_ij).
/// general: the hidden sum is exact, over all 2^hidden states in Gray-code order (hidden &lt;= 24).
/// Inputs are one byte per visible unit, nonzero = on. Thread-safe; batch scoring is parallel and gives the
/// same bits as serial scoring since each vector is computed alone.
/// </summary>
public sealed class ReferenceScorer
{
    /// <summary>Most hidden units for which a general model's free energy is computed exactly.</summary>
    public const int MaxGeneralHidden = 24;

    private readonly BoltzmannModel _model;
    private readonly double[] _w;
    private readonly double[] _b;
    private readonly double[] _c;
    private readonly (int Other, double W)[][] _lateral;  // per visible unit i: links (j, L_ij) with j < i
    private readonly double[]? _hiddenPairs;              // general: H×H symmetric

    /// <summary>A scorer for <paramref name="model"/>.</summary>
    public ReferenceScorer(BoltzmannModel model)
    {
        _model = model;
        _w = model.Weights.ToArray();
        _b = model.VisibleBias.ToArray();
        _c = model.HiddenBias.ToArray();
        var lists = new List<(int, double)>[model.Visible];
        foreach (var l in model.VisibleLinks) (lists[l.J] ??= new()).Add((l.I, l.W));
        _lateral = lists.Select(x => x?.ToArray() ?? []).ToArray();
        if (model.Kind == ModelKind.General)
        {
            if (model.Hidden > MaxGeneralHidden)
                throw new EmitException($"a general model's free energy sums over 2^{model.Hidden} hidden states",
                    $"the reference scorer allows hidden <= {MaxGeneralHidden} for kind general");
            _hiddenPairs = new double[model.Hidden * model.Hidden];
            foreach (var l in model.HiddenLinks)
            {
                _hiddenPairs[l.I * model.Hidden + l.J] = l.W;
                _hiddenPairs[l.J * model.Hidden + l.I] = l.W;
            }
        }
    }

    /// <summary>The model scored.</summary>
    public BoltzmannModel Model => _model;

    /// <summary>F(v) for one vector of <see cref="BoltzmannModel.Visible"/> bytes.</summary>
    public double FreeEnergy(ReadOnlySpan<byte> units)
    {
        int v = _model.Visible, h = _model.Hidden;
        if (units.Length != v) throw new ArgumentException($"expected {v} units, got {units.Length}", nameof(units));
        Span<double> acc = h <= 512 ? stackalloc double[h] : new double[h];
        _c.AsSpan().CopyTo(acc);
        double linear = 0;
        for (int i = 0; i < v; i++)
        {
            if (units[i] == 0) continue;
            linear += _b[i];
            foreach (var (other, w) in _lateral[i])
                if (units[other] != 0) linear += w;
            AddRow(acc, _w.AsSpan(i * h, h));
        }
        if (_hiddenPairs is null)
        {
            double sp = 0;
            for (int j = 0; j < h; j++) sp += Softplus.Of(acc[j]);
            return -linear - sp;
        }
        var sum = new GrayCodeSum(acc.ToArray(), _hiddenPairs, [], []);
        return -linear - sum.LogSumExp(parallel: false);
    }

    /// <summary>log p(v) = −F(v) − log Z; needs the model's stored log partition.</summary>
    public double LogProbability(double freeEnergy) =>
        -freeEnergy - (_model.LogPartition?.Value
            ?? throw new EmitException("the model has no log_partition", "run emit logz and store it"));

    /// <summary>
    /// Scores <paramref name="rows"/> vectors laid end to end in <paramref name="units"/>, in parallel.
    /// </summary>
    public void FreeEnergies(ReadOnlySpan<byte> units, int rows, Span<double> result)
    {
        int v = _model.Visible;
        if (units.Length < (long)rows * v || result.Length < rows) throw new ArgumentException("buffers too small");
        var input = units[..(rows * v)].ToArray();
        var output = new double[rows];
        FreeEnergies(input, rows, output);
        output.AsSpan(0, rows).CopyTo(result);
    }

    /// <summary>As the span overload, without copies: each chunk of 64 vectors is one parallel work item.</summary>
    public void FreeEnergies(byte[] units, int rows, double[] result)
    {
        int v = _model.Visible;
        if (units.Length < (long)rows * v || result.Length < rows) throw new ArgumentException("buffers too small");
        const int chunk = 64;
        Parallel.For(0, (rows + chunk - 1) / chunk, c =>
        {
            int end = Math.Min(rows, (c + 1) * chunk);
            for (int r = c * chunk; r < end; r++) result[r] = FreeEnergy(units.AsSpan(r * v, v));
        });
    }

    private static void AddRow(Span<double> acc, ReadOnlySpan<double> row)
    {
        int i = 0;
        if (Vector.IsHardwareAccelerated)
            for (; i <= acc.Length - Vector<double>.Count; i += Vector<double>.Count)
                (new Vector<double>(acc[i..]) + new Vector<double>(row[i..])).CopyTo(acc[i..]);
        for (; i < acc.Length; i++) acc[i] += row[i];
    }
}
