using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using Emit.Model;

namespace Emit.Reference;

/// <summary>
/// The double-precision free energy F(v) = −log Σ_h exp(−E(v,h)) that all generated code is judged against.
/// rbm and lateral: F(v) = −b·v − Σ_{i&lt;j} L_ij v_i v_j − Σ_j softplus(c_j + Σ_i v_i W_ij).
/// general: the hidden sum is exact, over all 2^hidden states in Gray-code order (hidden &lt;= 24).
/// Inputs are one byte per visible unit, nonzero = on. Thread-safe; batch scoring is parallel and gives the
/// same bits as serial scoring since each vector is computed alone.
/// </summary>
/// <remarks>
/// rbm and lateral: the pre-activations are c plus the rows of the units that are on, added four rows at a time
/// (acc += (row_a + row_b) + (row_c + row_d), rows in index order: a quarter of the accumulator loads and stores
/// of one row at a time); the softplus terms go through <see cref="VectorSoftplus.Sum"/>. Every operation is an
/// IEEE addition, multiplication or division in a fixed order, so the bits do not depend on the thread count,
/// the vector width or the C runtime.
/// </remarks>
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
        Span<int> active = v <= 1024 ? stackalloc int[v] : new int[v];
        active = active[..ActiveUnits(units, active)];
        double linear = Linear(units, active);
        Span<double> acc = h <= 512 ? stackalloc double[h] : new double[h];
        if (_hiddenPairs is null)
        {
            SumRows(acc, active);
            return -linear - VectorSoftplus.Sum(acc);
        }
        _c.AsSpan().CopyTo(acc);
        foreach (int i in active) AddRow(acc, _w.AsSpan(i * h, h));
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

    /// <summary>Indices of the units that are on, ascending; returns how many.</summary>
    private static int ActiveUnits(ReadOnlySpan<byte> units, Span<int> active)
    {
        int n = 0, i = 0;
        ref byte u = ref MemoryMarshal.GetReference(units);
        for (; i <= units.Length - Vector512<byte>.Count; i += Vector512<byte>.Count)
        {
            ulong on = ~Vector512.Equals(Vector512.LoadUnsafe(ref u, (nuint)i), Vector512<byte>.Zero)
                .ExtractMostSignificantBits();
            for (; on != 0; on &= on - 1) active[n++] = i + BitOperations.TrailingZeroCount(on);
        }
        for (; i < units.Length; i++)
            if (units[i] != 0) active[n++] = i;
        return n;
    }

    /// <summary>b·v plus the lateral terms of the active units.</summary>
    private double Linear(ReadOnlySpan<byte> units, ReadOnlySpan<int> active)
    {
        double linear = 0;
        foreach (int i in active)
        {
            linear += _b[i];
            foreach (var (other, w) in _lateral[i])
                if (units[other] != 0) linear += w;
        }
        return linear;
    }

    /// <summary>
    /// acc = c + Σ rows of the active units, four rows per step (acc += (row_a + row_b) + (row_c + row_d), then a
    /// pair, then a single row): per element the same additions in the same order in vector lanes or the scalar tail.
    /// </summary>
    private void SumRows(Span<double> acc, ReadOnlySpan<int> active)
    {
        int h = _model.Hidden, len = acc.Length;
        _c.AsSpan().CopyTo(acc);
        ref double a = ref MemoryMarshal.GetReference(acc);
        ref double w = ref MemoryMarshal.GetArrayDataReference(_w);
        int n = active.Length, p = 0;
        for (; p + 3 < n; p += 4)
        {
            nuint r1 = (nuint)(active[p] * h), r2 = (nuint)(active[p + 1] * h);
            nuint r3 = (nuint)(active[p + 2] * h), r4 = (nuint)(active[p + 3] * h);
            int j = 0;
            for (; j <= len - Vector512<double>.Count; j += Vector512<double>.Count)
            {
                var q = (Vector512.LoadUnsafe(ref w, r1 + (nuint)j) + Vector512.LoadUnsafe(ref w, r2 + (nuint)j))
                    + (Vector512.LoadUnsafe(ref w, r3 + (nuint)j) + Vector512.LoadUnsafe(ref w, r4 + (nuint)j));
                (Vector512.LoadUnsafe(ref a, (nuint)j) + q).StoreUnsafe(ref a, (nuint)j);
            }
            for (; j < len; j++)
                Unsafe.Add(ref a, j) += (Unsafe.Add(ref w, r1 + (nuint)j) + Unsafe.Add(ref w, r2 + (nuint)j))
                    + (Unsafe.Add(ref w, r3 + (nuint)j) + Unsafe.Add(ref w, r4 + (nuint)j));
        }
        for (; p + 1 < n; p += 2)
        {
            nuint r1 = (nuint)(active[p] * h), r2 = (nuint)(active[p + 1] * h);
            int j = 0;
            for (; j <= len - Vector512<double>.Count; j += Vector512<double>.Count)
            {
                var pair = Vector512.LoadUnsafe(ref w, r1 + (nuint)j) + Vector512.LoadUnsafe(ref w, r2 + (nuint)j);
                (Vector512.LoadUnsafe(ref a, (nuint)j) + pair).StoreUnsafe(ref a, (nuint)j);
            }
            for (; j < len; j++)
                Unsafe.Add(ref a, j) += Unsafe.Add(ref w, r1 + (nuint)j) + Unsafe.Add(ref w, r2 + (nuint)j);
        }
        if (p < n) AddRow(acc, _w.AsSpan(active[p] * h, len));
    }

    private static void AddRow(Span<double> acc, ReadOnlySpan<double> row)
    {
        ref double a = ref MemoryMarshal.GetReference(acc);
        ref double r = ref MemoryMarshal.GetReference(row);
        int j = 0, len = acc.Length;
        for (; j <= len - Vector512<double>.Count; j += Vector512<double>.Count)
        {
            var sum = Vector512.LoadUnsafe(ref a, (nuint)j) + Vector512.LoadUnsafe(ref r, (nuint)j);
            sum.StoreUnsafe(ref a, (nuint)j);
        }
        for (; j < len; j++) Unsafe.Add(ref a, j) += Unsafe.Add(ref r, j);
    }
}
