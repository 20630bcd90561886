using System.Numerics;
using System.Numerics.Tensors;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using Emit.Model;

namespace Emit.Training;

/// <summary>Positive and negative phase of one batch slot, and the parameter update.</summary>
internal sealed partial class TrainingRun
{
    /// <summary>
    /// Slot k: the positive statistics of the batch's k-th row (when it has one), then its chain's negative phase.
    /// </summary>
    private void SlotWork(int k)
    {
        var slot = _slot[k];
        if (k < _rowsInBatch)
        {
            var v0 = _data.Row(_order[_batchStart + k]);
            var ph = _phPos.AsSpan(k * _nh, _nh);
            HiddenInput(v0, slot.A);
            if (_kind == ModelKind.General)
                Posterior(slot, _hhPos.AsSpan(k * _nh * _nh, _nh * _nh), ph);
            else
                for (int j = 0; j < _nh; j++) ph[j] = TrainingMath.Sigmoid(slot.A[j]);
            if (_s.Method == TrainingMethod.Cd)
            {
                // CD-k: the chain starts at the data row with hidden units drawn from their posterior.
                v0.CopyTo(slot.V);
                if (_kind == ModelKind.General) DrawFromPosterior(slot);
                else for (int j = 0; j < _nh; j++) slot.H[j] = slot.Rng.NextDouble() < ph[j] ? (byte)1 : (byte)0;
            }
        }
        var hNeg = _hNeg.AsSpan(k * _nh, _nh);
        for (int step = 0; step < _s.GibbsSteps; step++)
        {
            VisibleSweep(slot);
            HiddenSweep(slot, hNeg, last: step == _s.GibbsSteps - 1);
        }
        slot.V.CopyTo(_vNeg.AsSpan(k * _nv, _nv));
    }

    /// <summary>a = c + Σ_{i: v_i = 1} W_i (rows of W added in unit order).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void HiddenInput(ReadOnlySpan<byte> v, Span<double> a)
    {
        _p.C.CopyTo(a);
        var w = _p.W;
        for (int i = 0; i < _nv; i++)
            if (v[i] != 0) TensorPrimitives.Add(a, w.AsSpan(i * _nh, _nh), a);
    }

    /// <summary>
    /// Visible units given the hidden ones: in one block for kind rbm (they are independent), else one at a time
    /// in unit order, each from its energy gap b_i + Σ_j W_ij h_j + Σ_k L_ik v_k given the current values of the
    /// others.
    /// </summary>
    private void VisibleSweep(Slot slot)
    {
        var field = slot.Field;
        _p.B.CopyTo(field, 0);
        var wt = _p.WT;
        for (int j = 0; j < _nh; j++)
            if (slot.H[j] != 0) TensorPrimitives.Add(field, wt.AsSpan(j * _nv, _nv), field);
        var v = slot.V;
        if (_p.L is not { } l)
        {
            for (int i = 0; i < _nv; i++)
                v[i] = slot.Rng.NextDouble() < TrainingMath.Sigmoid(field[i]) ? (byte)1 : (byte)0;
            return;
        }
        for (int i = 0; i < _nv; i++)
        {
            double x = field[i];
            var row = l.AsSpan(i * _nv, _nv);
            for (int k = 0; k < _nv; k++)
                if (v[k] != 0) x += row[k];
            v[i] = slot.Rng.NextDouble() < TrainingMath.Sigmoid(x) ? (byte)1 : (byte)0;
        }
    }

    /// <summary>
    /// Hidden units given the visible ones: in one block (kinds rbm and lateral; the negative statistic is then
    /// p(h | v), which has less noise than a sample: practical guide, section 3), or one at a time (general; the
    /// statistic is the sample). The chain keeps a sample.
    /// </summary>
    private void HiddenSweep(Slot slot, Span<double> stat, bool last)
    {
        HiddenInput(slot.V, slot.A);
        var h = slot.H;
        if (_p.M is not { } m)
        {
            for (int j = 0; j < _nh; j++)
            {
                double p = TrainingMath.Sigmoid(slot.A[j]);
                if (last) stat[j] = p;
                h[j] = slot.Rng.NextDouble() < p ? (byte)1 : (byte)0;
            }
            return;
        }
        for (int j = 0; j < _nh; j++)
        {
            double x = slot.A[j];
            var row = m.AsSpan(j * _nh, _nh);
            for (int k = 0; k < _nh; k++)
                if (h[k] != 0) x += row[k];
            h[j] = slot.Rng.NextDouble() < TrainingMath.Sigmoid(x) ? (byte)1 : (byte)0;
        }
        if (last) for (int j = 0; j < _nh; j++) stat[j] = h[j];
    }

    /// <summary>
    /// Exact posterior over hidden states given the hidden inputs in slot.A (kind general): every state h of the
    /// 2^hidden is visited in Gray-code order with its score a·h + Σ_{k&lt;l} M_kl h_k h_l updated by one flip;
    /// then E[h_k] and E[h_k h_l] under weights exp(score - max).
    /// </summary>
    private void Posterior(Slot slot, Span<double> hh, Span<double> ph)
    {
        var table = slot.Table!;
        var m = _p.M!;
        int nh = _nh;
        var field = slot.HiddenField;
        slot.A.CopyTo(field, 0);
        uint state = 0;
        double score = 0, max = 0;
        table[0] = 0;
        for (uint t = 1; t < (1u << nh); t++)
        {
            int k = BitOperations.TrailingZeroCount(t);
            double sign;
            if ((state & (1u << k)) == 0) { score += field[k]; sign = 1; }
            else { score -= field[k]; sign = -1; }
            state ^= 1u << k;
            for (int l = 0; l < nh; l++) field[l] += sign * m[l * nh + k];
            table[state] = score;
            if (score > max) max = score;
        }
        double total = 0;
        for (int g = 0; g < table.Length; g++) total += table[g] = TrainingMath.Exp(table[g] - max);
        ph.Clear();
        hh.Clear();
        for (int g = 1; g < table.Length; g++)
        {
            double w = table[g];
            for (uint bits = (uint)g; bits != 0; bits &= bits - 1)
            {
                int k = BitOperations.TrailingZeroCount(bits);
                ph[k] += w;
                for (uint rest = bits & (bits - 1); rest != 0; rest &= rest - 1)
                    hh[k * nh + BitOperations.TrailingZeroCount(rest)] += w;
            }
        }
        for (int k = 0; k < nh; k++)
        {
            ph[k] /= total;
            for (int l = k + 1; l < nh; l++) hh[l * nh + k] = hh[k * nh + l] /= total;
        }
        slot.Total = total;
    }

    /// <summary>
    /// Draws the slot's hidden state from the posterior table <see cref="Posterior"/> left (inverse CDF in state
    /// order).
    /// </summary>
    private void DrawFromPosterior(Slot slot)
    {
        var table = slot.Table!;
        double u = slot.Rng.NextDouble() * slot.Total, acc = 0;
        int g = 0;
        for (; g < table.Length - 1; g++)
        {
            acc += table[g];
            if (u < acc) break;
        }
        for (int j = 0; j < _nh; j++) slot.H[j] = (byte)((g >> j) & 1);
    }

    /// <summary>
    /// One momentum step on every parameter (practical guide, section 9): Δθ ← μΔθ + ε(∂ - λθ) with λ only on
    /// couplings, ∂ = positive minus negative statistics, each averaged over its rows in row order.
    /// Parallel over chunks of visible units; each unit's row of W (and L) is computed by one thread in a fixed order.
    /// </summary>
    private const int UpdateChunk = 2048;

    private OnUnits? _posOn, _negOn;
    private bool _rowListsSet;
    private int[]? _allRows; // 0, 1, …, slots - 1
    private int[]? _posCount, _negCount; // batch rows and chains with each visible unit on (one-chunk update)

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Update(double lr, double momentum)
    {
        int n = _rowsInBatch, nNeg = _negRows, nv = _nv, nh = _nh;
        double wd = _s.WeightDecay;
        _posOn ??= new OnUnits(nv, _slots);
        _negOn ??= new OnUnits(nv, _slots);
        if (!_rowListsSet)
        {
            // The kinds with links sample slot by slot and leave no lists of the units on.
            _onData ??= new OnUnits(_slots, nv);
            _onV ??= new OnUnits(_slots, nv);
            for (int r = 0; r < n; r++) _onData.Set(r, _data.Row(_order[_batchStart + r]));
            for (int r = 0; r < nNeg; r++) _onV.Set(r, _vNeg.AsSpan(r * nv, nv));
        }
        _rowListsSet = false;
        // Visible units in chunks of about UpdateChunk weights, so short rows (few hidden units) share each call and
        // each chunk's sums stay in the thread's cache.
        int chunk = Math.Max(1, UpdateChunk / nh), chunks = (nv + chunk - 1) / chunk;
        // One chunk (all of W, at most UpdateChunk weights): each batch row's p(h | v) is added to the rows of the
        // units it has on, rows in order, with no per-unit lists; several chunks: per-unit lists, so each chunk
        // (thread) sums only its own units. The same additions in the same order either way.
        bool byRow = chunks == 1;
        if (!byRow)
        {
            _posOn.SetTransposed(_onData!, n);
            _negOn.SetTransposed(_onV!, nNeg);
        }
        _posCount ??= new int[nv];
        _negCount ??= new int[nv];
        For(chunks, (long)(n + nNeg) * nh * chunk / 3, [MethodImpl(MethodImplOptions.AggressiveOptimization)] (c) =>
        {
            int i0 = c * chunk, i1 = Math.Min(nv, i0 + chunk), span = (i1 - i0) * nh;
            var scratch = _chunkScratch.Value!;
            var pos = scratch.AsSpan(0, span);
            var neg = scratch.AsSpan(span, span);
            // Σ over batch rows with v_i = 1 of p(h | v), rows in order: the products V0ᵀP and VnegᵀQ.
            if (byRow)
            {
                RowSums.Scatter(_onData!, n, _phPos, nh, pos, _posCount);
                RowSums.Scatter(_onV!, nNeg, _hNeg, nh, neg, _negCount);
            }
            else
            {
                RowSums.Rows(_posOn, i0, i1, _phPos, nh, pos);
                RowSums.Rows(_negOn, i0, i1, _hNeg, nh, neg);
            }
            Step(pos, n, neg, nNeg, _p.W.AsSpan(i0 * nh, span), _velocity!.W.AsSpan(i0 * nh, span), lr, momentum,
                wd);
            for (int i = i0; i < i1; i++)
            {
                int onPos = byRow ? _posCount[i] : _posOn.Of(i).Length;
                int onNeg = byRow ? _negCount[i] : _negOn.Of(i).Length;
                double gb = (double)onPos / n - (double)onNeg / nNeg;
                _velocity.B[i] = momentum * _velocity.B[i] + lr * gb;
                _p.B[i] += _velocity.B[i];
                if (_p.L is { } l) UpdateLinks(l, i, lr, momentum);
            }
        });
        {
            // Hidden biases: the same step with the batch sums of p(h | v) (no decay); sums in row order.
            var scratch = _rowScratch.Value!;
            var pos = scratch.AsSpan(0, nh);
            var neg = scratch.AsSpan(nh, nh);
            pos.Clear();
            neg.Clear();
            // Rows 0, 1, … added in order with the row sums' register-held loop (one call, not one per row).
            _allRows ??= Enumerable.Range(0, _slots).ToArray();
            RowSums.Add(_allRows.AsSpan(0, n), _phPos, nh, 0, pos);
            RowSums.Add(_allRows.AsSpan(0, nNeg), _hNeg, nh, 0, neg);
            Step(pos, n, neg, nNeg, _p.C, _velocity!.C, lr, momentum, 0);
        }
        if (_p.M is { } mm)
        {
            for (int k = 0; k < nh; k++)
                for (int l = k + 1; l < nh; l++)
                {
                    double pos = 0, neg = 0;
                    for (int r = 0; r < n; r++) pos += _hhPos![r * nh * nh + k * nh + l];
                    for (int r = 0; r < nNeg; r++) neg += _hNeg[r * nh + k] * _hNeg[r * nh + l];
                    double g = pos / n - neg / nNeg;
                    var dm = _velocity!.M!;
                    dm[k * nh + l] = momentum * dm[k * nh + l] + lr * (g - wd * mm[k * nh + l]);
                    dm[l * nh + k] = dm[k * nh + l];
                    mm[k * nh + l] += dm[k * nh + l];
                    mm[l * nh + k] = mm[k * nh + l];
                }
        }
        For(Parameters.TransposeBlocks(nh), (long)nv * Parameters.TransposeTile, _p.Transpose);
    }

    /// <summary>
    /// The step on row <paramref name="i"/> of the visible links from co-occurrence counts in row order.
    /// </summary>
    private void UpdateLinks(double[] l, int i, double lr, double momentum)
    {
        int n = _rowsInBatch, nNeg = _negRows, nv = _nv;
        double wd = _s.WeightDecay;
        var scratch = _rowScratch.Value!;
        var cPos = scratch.AsSpan(0, nv);
        var cNeg = scratch.AsSpan(nv, nv);
        cPos.Clear();
        cNeg.Clear();
        for (int r = 0; r < n; r++)
        {
            var row = _data.Row(_order[_batchStart + r]);
            if (row[i] != 0) for (int k = 0; k < nv; k++) cPos[k] += row[k];
        }
        for (int r = 0; r < nNeg; r++)
        {
            var row = _vNeg.AsSpan(r * nv, nv);
            if (row[i] != 0) for (int k = 0; k < nv; k++) cNeg[k] += row[k];
        }
        var li = l.AsSpan(i * nv, nv);
        var dl = _velocity!.L!.AsSpan(i * nv, nv);
        for (int k = 0; k < nv; k++)
        {
            if (k == i) continue;
            // Counts are symmetric in (i, k), so L stays exactly symmetric.
            double g = cPos[k] / n - cNeg[k] / nNeg;
            dl[k] = momentum * dl[k] + lr * (g - wd * li[k]);
            li[k] += dl[k];
        }
    }

    /// <summary>
    /// Δθ ← μΔθ + ε(pos/n - neg/nNeg - λθ); θ ← θ + Δθ, element by element, eight (or four) elements at a time in one
    /// pass. Every operation is rounded on its own (no fused multiply-add), so each element gets the bits of the
    /// scalar expression whatever the vector width.
    /// </summary>
    /// <remarks>
    /// Own loop rather than one TensorPrimitives call per operation: in the small benchmark the library's kernels ran
    /// unoptimised (tier 0) for the first part of every run under .NET's default tiered compilation, and making them
    /// optimised from the start needed a runtime setting that slowed every command's start-up (docs/train.md, "Speed").
    /// </remarks>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static void Step(ReadOnlySpan<double> pos, int n, ReadOnlySpan<double> neg, int nNeg, Span<double> theta,
        Span<double> velocity, double lr, double momentum, double decay)
    {
        double dn = n, dNeg = nNeg;
        int k = 0, len = theta.Length;
        if (Vector512.IsHardwareAccelerated)
            for (; k + 8 <= len; k += 8)
            {
                var th = Vector512.Create((ReadOnlySpan<double>)theta.Slice(k, 8));
                var g = Vector512.Create(pos.Slice(k, 8)) / dn
                        - Vector512.Create(neg.Slice(k, 8)) / dNeg;
                var step = (g - th * decay) * lr;
                var v = Vector512.Create((ReadOnlySpan<double>)velocity.Slice(k, 8)) * momentum + step;
                v.CopyTo(velocity.Slice(k, 8));
                (th + v).CopyTo(theta.Slice(k, 8));
            }
        else if (Vector256.IsHardwareAccelerated)
            for (; k + 4 <= len; k += 4)
            {
                var th = Vector256.Create((ReadOnlySpan<double>)theta.Slice(k, 4));
                var g = Vector256.Create(pos.Slice(k, 4)) / dn
                        - Vector256.Create(neg.Slice(k, 4)) / dNeg;
                var step = (g - th * decay) * lr;
                var v = Vector256.Create((ReadOnlySpan<double>)velocity.Slice(k, 4)) * momentum + step;
                v.CopyTo(velocity.Slice(k, 4));
                (th + v).CopyTo(theta.Slice(k, 4));
            }
        for (; k < len; k++)
        {
            double g = pos[k] / dn - neg[k] / dNeg;
            double v = velocity[k] * momentum + (g - theta[k] * decay) * lr;
            velocity[k] = v;
            theta[k] += v;
        }
    }
}
