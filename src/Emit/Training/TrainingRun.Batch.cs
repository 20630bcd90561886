using System.Runtime.CompilerServices;

namespace Emit.Training;

/// <summary>
/// Kind rbm's batch, phase by phase over all slots: each phase's product is one <see cref="RowSums"/> call over the
/// batch (blocked, split over column blocks), and each chain's sampling uses its own slot's random stream in unit
/// order, so the model is bit for bit the one <see cref="SlotWork"/> gives (the kinds with links still use that).
/// </summary>
internal sealed partial class TrainingRun
{
    private OnUnits? _onData, _onV, _onH; // the batch's rows, the chains' visible and hidden states
    private double[]? _field; // slots × nv: visible inputs b + W h of the chains
    private double[]? _act;   // slots × nh: hidden inputs c + vW of the chains

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void RbmBatch()
    {
        _onData ??= new OnUnits(_slots, _nv);
        _onV ??= new OnUnits(_slots, _nv);
        _onH ??= new OnUnits(_slots, _nh);
        _field ??= new double[_slots * _nv];
        _act ??= new double[_slots * _nh];
        int n = _rowsInBatch, nNeg = _negRows, nv = _nv, nh = _nh;

        // Positive phase: p(h | v) of the batch rows.
        for (int r = 0; r < n; r++) _onData.Set(r, _data.Row(_order[_batchStart + r]));
        Product(_onData, n, _p.W, _p.C, _phPos);
        TrainingMath.Sigmoid(_phPos.AsSpan(0, n * nh), _phPos.AsSpan(0, n * nh));
        if (_s.Method == TrainingMethod.Cd)
        {
            // CD-k: each chain starts at its data row with hidden units drawn from their posterior.
            for (int r = 0; r < n; r++)
            {
                var slot = _slot[r];
                _data.Row(_order[_batchStart + r]).CopyTo(slot.V);
                var ph = _phPos.AsSpan(r * nh, nh);
                slot.Rng.Bernoulli(ph, slot.H);
            }
        }

        // Negative phase: Gibbs steps of the chains, visible units in one block, then hidden units in one block.
        for (int step = 0; step < _s.GibbsSteps; step++)
        {
            bool last = step == _s.GibbsSteps - 1;
            for (int r = 0; r < nNeg; r++) _onH.Set(r, _slot[r].H);
            Product(_onH, nNeg, _p.WT, _p.B, _field);
            For(nNeg, nv * 8L, [MethodImpl(MethodImplOptions.AggressiveOptimization)] (r) =>
            {
                var slot = _slot[r];
                var p = _field.AsSpan(r * nv, nv);
                TrainingMath.Sigmoid(p, p);
                slot.Rng.Bernoulli(p, slot.V);
            });
            for (int r = 0; r < nNeg; r++) _onV.Set(r, _slot[r].V);
            Product(_onV, nNeg, _p.W, _p.C, _act);
            For(nNeg, nh * 8L, [MethodImpl(MethodImplOptions.AggressiveOptimization)] (r) =>
            {
                var slot = _slot[r];
                var p = _act.AsSpan(r * nh, nh);
                TrainingMath.Sigmoid(p, p);
                // The statistic is p(h | v), which has less noise than a sample (practical guide, section 3).
                if (last) p.CopyTo(_hNeg.AsSpan(r * nh, nh));
                slot.Rng.Bernoulli(p, slot.H);
            });
        }
        for (int r = 0; r < nNeg; r++) _slot[r].V.CopyTo(_vNeg.AsSpan(r * nv, nv));
        // The update's sums walk the same lists: _onData holds the batch rows, _onV the chains' last visible states.
        _rowListsSet = true;
    }

    /// <summary>y = bias + (0/1 rows of <paramref name="on"/>) × m, split over column blocks.</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Product(OnUnits on, int rows, double[] m, double[] bias, double[] y)
    {
        int width = bias.Length, depth = m.Length / width;
        // About a third of the units are on in typical binary data: the work estimate only picks serial or parallel.
        long work = (long)rows * depth * Math.Min(width, RowSums.BlockColumns) / 3;
        For(RowSums.Blocks(width), work,
            [MethodImpl(MethodImplOptions.AggressiveOptimization)] (b) => RowSums.Block(b, on, rows, m, bias, y));
    }
}
