using Emit.Model;

namespace Emit.Training;

/// <summary>
/// Settings of <see cref="Trainer"/>. The defaults are the ones <c>emit train</c> uses (docs/train.md says why each is
/// what it is): persistent CD with one Gibbs step, mini-batches of 10, 400 epochs, learning rate 0.05 decaying
/// linearly to zero over the last half of the epochs (Tieleman 2008 decays to zero), momentum 0.5 and L2 weight decay
/// 1e-4 (Hinton, "A practical guide to training restricted Boltzmann machines", UTML TR 2010-003, sections 5, 9 and
/// 10). The guide's momentum of 0.9 after the first epochs made persistent chains fall behind the model on the
/// digits benchmark (docs/benchmarks.md), so the default keeps 0.5 throughout.
/// </summary>
public sealed record TrainerSettings
{
    /// <summary>Largest hidden layer for kind general: its positive phase enumerates 2^hidden states per row.</summary>
    public const int MaxGeneralHidden = 16;

    /// <summary>Which couplings the model has.</summary>
    public ModelKind Kind { get; init; } = ModelKind.Rbm;

    /// <summary>Hidden units.</summary>
    public int Hidden { get; init; } = 16;

    /// <summary>CD-k or persistent CD.</summary>
    public TrainingMethod Method { get; init; } = TrainingMethod.Pcd;

    /// <summary>Gibbs steps per update (the k of CD-k; sweeps of the persistent chains per update).</summary>
    public int GibbsSteps { get; init; } = 1;

    /// <summary>Passes over the training rows (at most; early stopping may end sooner).</summary>
    public int Epochs { get; init; } = 400;

    /// <summary>Rows per parameter update; also the number of persistent chains.</summary>
    public int BatchSize { get; init; } = 10;

    /// <summary>
    /// Step size on the batch-average gradient at the start; it decays linearly to zero over the last half of the
    /// epochs.
    /// </summary>
    public double LearningRate { get; init; } = 0.05;

    /// <summary>Momentum for the first <see cref="MomentumSwitchEpoch"/> epochs.</summary>
    public double InitialMomentum { get; init; } = 0.5;

    /// <summary>Momentum from epoch <see cref="MomentumSwitchEpoch"/> on.</summary>
    public double Momentum { get; init; } = 0.5;

    /// <summary>The first epoch (0-based) using <see cref="Momentum"/>.</summary>
    public int MomentumSwitchEpoch { get; init; } = 5;

    /// <summary>L2 weight decay on the couplings (W and links), not on the biases.</summary>
    public double WeightDecay { get; init; } = 1e-4;

    /// <summary>Initial weights are uniform in [-scale, scale].</summary>
    public double InitialWeightScale { get; init; } = 0.01;

    /// <summary>
    /// When true, the learning rate decays linearly to zero over the second half of the epochs; else it is constant.
    /// </summary>
    public bool DecayLearningRate { get; init; } = true;

    /// <summary>Epochs without a better validation score before training stops (0: never stop early).</summary>
    public int Patience { get; init; } = 20;

    /// <summary>Seed of the trainer's SplitMix64 streams (initial weights, shuffling, Gibbs sampling).</summary>
    public ulong Seed { get; init; } = 1;

    /// <summary>Worker threads (1 or more). The trained model does not depend on it.</summary>
    public int Threads { get; init; } = 1;

    /// <summary>
    /// The least work, in additions (about), for which a loop of the trainer is split over <see cref="Threads"/>:
    /// below it, handing the pieces to other threads and waiting for them costs more than it saves. With 60 000 the
    /// small digits benchmark (64 visible × 16 hidden, batch 10) split its per-epoch reconstruction figure
    /// (256 × 64 × 16 = 262 144) over two threads and ran slower with two threads than with one; the large benchmark's
    /// loops (784 × 500, batch 100) have millions and are still split (docs/train.md, "Speed"). Only tests change it
    /// (to force every loop onto threads); the model never depends on it.
    /// </summary>
    internal long ParallelWork { get; init; } = 300_000;

    /// <summary>
    /// What is wrong with the settings, as (setting name, problem) pairs; empty when they are usable.
    /// </summary>
    public IReadOnlyList<(string Setting, string Problem)> Problems()
    {
        var p = new List<(string, string)>();
        if (Hidden < 1) p.Add(("hidden", $"must be at least 1 (got {Hidden})"));
        if (Kind == ModelKind.General && Hidden > MaxGeneralHidden)
            p.Add(("hidden",
                $"is {Hidden}; kind general allows at most {MaxGeneralHidden} (its positive phase enumerates " +
                "2^hidden states per row)"));
        if (GibbsSteps < 1) p.Add(("gibbs-steps", $"must be at least 1 (got {GibbsSteps})"));
        if (Epochs < 0) p.Add(("epochs", $"must not be negative (got {Epochs})"));
        if (BatchSize < 1) p.Add(("batch", $"must be at least 1 (got {BatchSize})"));
        if (!double.IsFinite(LearningRate) || LearningRate <= 0)
            p.Add(("learning-rate", $"must be a positive finite number (got {Text(LearningRate)})"));
        if (!double.IsFinite(Momentum) || Momentum < 0 || Momentum >= 1)
            p.Add(("momentum", $"must be in [0, 1) (got {Text(Momentum)})"));
        if (!double.IsFinite(InitialMomentum) || InitialMomentum < 0 || InitialMomentum >= 1)
            p.Add(("initial-momentum", $"must be in [0, 1) (got {Text(InitialMomentum)})"));
        if (!double.IsFinite(WeightDecay) || WeightDecay < 0)
            p.Add(("weight-decay", $"must be a finite number >= 0 (got {Text(WeightDecay)})"));
        if (!double.IsFinite(InitialWeightScale) || InitialWeightScale < 0)
            p.Add(("initial-weight-scale", $"must be a finite number >= 0 (got {Text(InitialWeightScale)})"));
        if (Patience < 0) p.Add(("patience", $"must not be negative (got {Patience})"));
        if (Threads < 1) p.Add(("threads", $"must be at least 1 (got {Threads})"));
        return p;
    }

    /// <summary>Throws <see cref="EmitException"/> for the first of <see cref="Problems"/>.</summary>
    public void Validate()
    {
        var p = Problems();
        if (p.Count > 0) throw new EmitException($"training setting {p[0].Setting} {p[0].Problem}");
    }

    private static string Text(double x) => x.ToString("R", System.Globalization.CultureInfo.InvariantCulture);
}
