using System.Runtime.CompilerServices;
using Emit.Model;
using Emit.Reference;

namespace Emit.Training;

/// <summary>The figures reported after each epoch.</summary>
internal sealed partial class TrainingRun
{
    /// <summary>Rows of each set used for the per-epoch figures (the first ones, in file order).</summary>
    internal const int MonitorRows = 2000;

    /// <summary>
    /// Training rows the reconstruction error is measured on (the first ones; a dense pass, so kept small).
    /// </summary>
    internal const int ReconstructionRows = 256;

    /// <summary>Exact log Z is computed each epoch when it enumerates at most 2^this states.</summary>
    internal const int ExactBits = 20;

    private int[] _pllUnit = [];
    private double[]? _squares;
    private OnUnits? _reconOn;

    private void PrepareEvaluation()
    {
        if (_validation is null) return;
        // The unit each validation row's pseudo-likelihood flips, drawn once so every epoch is scored on the same
        // terms.
        var rng = new SplitMix64(_s.Seed ^ 0x5EED_0F_5CE1EC7UL);
        _pllUnit = new int[Math.Min(_validation.Rows, MonitorRows)];
        for (int r = 0; r < _pllUnit.Length; r++) _pllUnit[r] = rng.NextBelow(_nv);
    }

    private EpochReport Evaluate(int epoch, double lr)
    {
        double recon = ReconstructionError();
        if (_validation is null)
            return new EpochReport(epoch, _s.Epochs, lr, recon, null, null, null, false);
        var model = _p.ToModel(_kind, default);
        var scorer = new ReferenceScorer(model);
        int nVal = Math.Min(_validation.Rows, MonitorRows), nTrain = Math.Min(_data.Rows, nVal);
        double fVal = 0, fTrain = 0;
        var energies = new double[nVal];
        for (int r = 0; r < nVal; r++) fVal += energies[r] = scorer.FreeEnergy(_validation.Row(r));
        for (int r = 0; r < nTrain; r++) fTrain += scorer.FreeEnergy(_data.Row(r));
        double gap = fVal / nVal - fTrain / nTrain;
        double? exact = null, pll = null;
        if (ExactFits(model))
        {
            double logZ = ExactLogPartition.Compute(model).LogPartition;
            exact = -fVal / nVal - logZ;
        }
        else
        {
            var flipped = new byte[_nv];
            double sum = 0;
            for (int r = 0; r < nVal; r++)
            {
                _validation.Row(r).CopyTo(flipped);
                flipped[_pllUnit[r]] ^= 1;
                // log p(v_u | v_rest) = -softplus(F(v) - F(v with u flipped)); scaled by the unit count (Besag 1975; as
                // scikit-learn's score_samples).
                sum -= Softplus.Of(energies[r] - scorer.FreeEnergy(flipped));
            }
            pll = _nv * sum / nVal;
        }
        return new EpochReport(epoch, _s.Epochs, lr, recon, gap, exact, pll, false);
    }

    /// <summary>
    /// True when exact log Z of <paramref name="model"/> enumerates at most 2^<see cref="ExactBits"/> states.
    /// </summary>
    internal static bool ExactFits(BoltzmannModel model)
    {
        try
        {
            return ExactLogPartition.States(model) <= 1L << ExactBits;
        }
        catch (EmitException)
        {
            return false;
        }
    }

    /// <summary>
    /// Mean squared difference between training rows and p(v_i | mean-field h, other visible units), over the first
    /// rows. Rows run in parallel, each writing its squared differences; they are summed afterwards in row and unit
    /// order. Each hidden input is c_j + Σ W_ij over the units on, added in i order (<see cref="RowSums.Add"/>), and
    /// each visible input is b_i + Σ_j W_ij a_j added in j order, each term rounded before it is added
    /// (<see cref="RowSums.AddScaled"/>), so the figure does not depend on threads or the vector width.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private double ReconstructionError()
    {
        int rows = Math.Min(_data.Rows, ReconstructionRows), nv = _nv, nh = _nh;
        _squares ??= new double[rows * nv];
        if (_reconOn is null)
        {
            // The rows never change: their lists of units on are made once.
            _reconOn = new OnUnits(rows, nv);
            for (int r = 0; r < rows; r++) _reconOn.Set(r, _data.Row(r));
        }
        var squares = _squares;
        var on = _reconOn;
        For(rows, (long)nv * nh, [MethodImpl(MethodImplOptions.AggressiveOptimization)] (r) =>
        {
            var v = _data.Row(r);
            var scratch = _rowScratch.Value!;
            var a = scratch.AsSpan(0, nh);
            var x = scratch.AsSpan(Math.Max(nv, nh), nv);
            _p.C.CopyTo(a);
            RowSums.Add(on.Of(r), _p.W, nh, 0, a);
            TrainingMath.Sigmoid(a, a);
            _p.B.CopyTo(x);
            RowSums.AddScaled(a, _p.WT, x);
            if (_p.L is { } l)
                for (int i = 0; i < nv; i++)
                    for (int k = 0; k < nv; k++)
                        if (v[k] != 0) x[i] += l[i * nv + k];
            TrainingMath.Sigmoid(x, x);
            var d = squares.AsSpan(r * nv, nv);
            for (int i = 0; i < nv; i++)
            {
                double e = v[i] - x[i];
                d[i] = e * e;
            }
        });
        double sum = 0;
        for (int k = 0; k < rows * nv; k++) sum += squares[k];
        return sum / ((double)rows * nv);
    }
}
