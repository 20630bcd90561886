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
    /// rows.
    /// </summary>
    private double ReconstructionError()
    {
        int rows = Math.Min(_data.Rows, ReconstructionRows);
        var a = new double[_nh];
        double sum = 0;
        for (int r = 0; r < rows; r++)
        {
            var v = _data.Row(r);
            HiddenInput(v, a);
            for (int j = 0; j < _nh; j++) a[j] = TrainingMath.Sigmoid(a[j]);
            for (int i = 0; i < _nv; i++)
            {
                double x = _p.B[i];
                var w = _p.W.AsSpan(i * _nh, _nh);
                for (int j = 0; j < _nh; j++) x += w[j] * a[j];
                if (_p.L is { } l)
                    for (int k = 0; k < _nv; k++)
                        if (v[k] != 0) x += l[i * _nv + k];
                double d = v[i] - TrainingMath.Sigmoid(x);
                sum += d * d;
            }
        }
        return sum / ((double)rows * _nv);
    }
}
