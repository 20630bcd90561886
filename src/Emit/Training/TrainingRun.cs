using System.Collections.Immutable;
using System.Numerics.Tensors;
using System.Runtime.CompilerServices;
using Emit.Model;

namespace Emit.Training;

/// <summary>The state of one <see cref="Trainer.Train"/> call (split by concern into partial files).</summary>
internal sealed partial class TrainingRun : IDisposable
{
    /// <summary>Visible biases start at log(p / (1 - p)) with p clipped to this distance from 0 and 1.</summary>
    internal const double MarginalClip = 0.001;

    private readonly TrainingData _data;
    private readonly TrainingData? _validation;
    private readonly TrainerSettings _s;
    private readonly ModelKind _kind;
    private readonly int _nv, _nh, _slots;
    private readonly Parameters _p;
    private readonly Parameters? _velocity;
    private readonly Slot[] _slot;
    private readonly double[] _phPos;     // slots × nh
    private readonly double[]? _hhPos;    // slots × nh × nh (general)
    private readonly byte[] _vNeg;        // slots × nv
    private readonly double[] _hNeg;      // slots × nh
    private readonly SplitMix64 _shuffle;
    private readonly ThreadLocal<double[]> _rowScratch;
    private readonly ThreadLocal<double[]> _chunkScratch;
    private readonly int[] _order;
    private int _rowsInBatch, _negRows, _batchStart;

    /// <summary>Loops that were split over threads so far (for the tests of the thread choice).</summary>
    internal int ParallelLoops { get; private set; }

    public TrainingRun(TrainingData data, TrainingData? validation, TrainerSettings s)
    {
        _data = data;
        _validation = validation;
        _s = s;
        _kind = s.Kind;
        _nv = data.Width;
        _nh = s.Hidden;
        _slots = s.BatchSize;
        var master = new SplitMix64(s.Seed);
        var init = new SplitMix64(master.Next());
        _shuffle = new SplitMix64(master.Next());
        _p = new Parameters(_nv, _nh, _kind != ModelKind.Rbm, _kind == ModelKind.General);
        _velocity = new Parameters(_nv, _nh, _kind != ModelKind.Rbm, _kind == ModelKind.General);
        for (int k = 0; k < _p.W.Length; k++) _p.W[k] = (2 * init.NextDouble() - 1) * s.InitialWeightScale;
        _p.Transpose();
        var constant = ImmutableArray.CreateBuilder<int>();
        for (int i = 0; i < _nv; i++)
        {
            int on = 0;
            for (int r = 0; r < data.Rows; r++) on += data.Units[r * _nv + i];
            if (on == 0 || on == data.Rows) constant.Add(i);
            double q = Math.Clamp((double)on / data.Rows, MarginalClip, 1 - MarginalClip);
            _p.B[i] = TrainingMath.Log(q / (1 - q));
        }
        ConstantUnits = constant.ToImmutable();
        _slot = new Slot[_slots];
        for (int k = 0; k < _slots; k++) _slot[k] = new Slot(_nv, _nh, _kind, master.Next());
        // Persistent chains start at training rows spread over the data (Tieleman 2008 starts them from data too).
        for (int k = 0; k < _slots; k++)
        {
            data.Row((int)((long)k * data.Rows / _slots)).CopyTo(_slot[k].V);
            for (int j = 0; j < _nh; j++) _slot[k].H[j] = 0;
        }
        _phPos = new double[_slots * _nh];
        _hhPos = _kind == ModelKind.General ? new double[_slots * _nh * _nh] : null;
        _vNeg = new byte[_slots * _nv];
        _hNeg = new double[_slots * _nh];
        _order = Enumerable.Range(0, data.Rows).ToArray();
        int scratch = Math.Max(_nv, _nh) * 4;
        _rowScratch = new ThreadLocal<double[]>(() => new double[scratch]);
        int chunkScratch = 2 * Math.Max(UpdateChunk, _nh);
        _chunkScratch = new ThreadLocal<double[]>(() => new double[chunkScratch]);
        PrepareEvaluation();
    }

    /// <summary>Releases the per-thread scratch rows.</summary>
    public void Dispose()
    {
        _rowScratch.Dispose();
        _chunkScratch.Dispose();
    }

    public ImmutableArray<int> ConstantUnits { get; }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public TrainingResult Execute(Action<EpochReport>? progress, CancellationToken cancel)
    {
        var reports = ImmutableArray.CreateBuilder<EpochReport>();
        Parameters? best = null;
        double bestScore = double.NegativeInfinity;
        int bestEpoch = 0;
        bool stoppedEarly = false;
        for (int epoch = 0; epoch < _s.Epochs; epoch++)
        {
            double lr = LearningRate(epoch);
            double momentum = epoch < _s.MomentumSwitchEpoch ? _s.InitialMomentum : _s.Momentum;
            for (int k = _order.Length - 1; k > 0; k--) // Fisher-Yates shuffle
            {
                int j = _shuffle.NextBelow(k + 1);
                (_order[k], _order[j]) = (_order[j], _order[k]);
            }
            for (int start = 0; start < _order.Length; start += _slots)
            {
                cancel.ThrowIfCancellationRequested();
                _batchStart = start;
                _rowsInBatch = Math.Min(_slots, _order.Length - start);
                _negRows = _s.Method == TrainingMethod.Pcd ? _slots : _rowsInBatch;
                if (_kind == ModelKind.Rbm) RbmBatch();
                else For(_negRows, (long)_nv * _nh, SlotWork);
                Update(lr, momentum);
            }
            CheckFinite(epoch + 1);
            var report = Evaluate(epoch + 1, lr);
            bool isBest = report.Score is { } score && score > bestScore;
            if (isBest)
            {
                bestScore = report.Score!.Value;
                bestEpoch = epoch + 1;
                if (best is null) best = _p.Clone();
                else _p.CopyTo(best);
            }
            report = report with { Best = isBest };
            reports.Add(report);
            progress?.Invoke(report);
            if (_validation is not null && _s.Patience > 0 && epoch + 1 - bestEpoch >= _s.Patience)
            {
                stoppedEarly = epoch + 1 < _s.Epochs;
                break;
            }
        }
        var kept = _validation is not null && best is not null ? best : _p;
        int keptEpoch = _validation is not null && best is not null ? bestEpoch : reports.Count;
        var model = kept.ToModel(_kind, _data.Names);
        return new TrainingResult(model, reports.ToImmutable(), keptEpoch, stoppedEarly, ConstantUnits);
    }

    /// <summary>
    /// The learning rate of an epoch: constant for the first half, then linearly down towards zero (Tieleman 2008
    /// decays it to zero).
    /// </summary>
    internal double LearningRate(int epoch)
    {
        if (!_s.DecayLearningRate) return _s.LearningRate;
        int half = _s.Epochs / 2;
        if (epoch < half) return _s.LearningRate;
        return _s.LearningRate * (_s.Epochs - epoch) / (_s.Epochs - half);
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void CheckFinite(int epoch)
    {
        static bool Finite(double[]? x)
        {
            if (x is null) return true;
            foreach (var d in x) if (!double.IsFinite(d)) return false;
            return true;
        }
        bool ok = Finite(_p.W) && Finite(_p.B) && Finite(_p.C) && Finite(_p.L) && Finite(_p.M);
        if (!ok)
            throw new EmitException($"training diverged in epoch {epoch}: a parameter is no longer a finite number",
                "use a smaller learning rate", _data.Source);
    }

    /// <summary>
    /// Runs body(0..count-1), on several threads when the loop has at least
    /// <see cref="TrainerSettings.ParallelWork"/> units of work (count × workPerItem); each index writes only its own
    /// outputs, so the choice never changes a result.
    /// </summary>
    private void For(int count, long workPerItem, Action<int> body)
    {
        if (_s.Threads <= 1 || count < 2 || count * workPerItem < _s.ParallelWork)
        {
            for (int k = 0; k < count; k++) body(k);
            return;
        }
        ParallelLoops++;
        Parallel.For(0, count, new ParallelOptions { MaxDegreeOfParallelism = _s.Threads }, body);
    }
}
