namespace Emit.Demo;

/// <summary>
/// Settings of the demo's contrastive-divergence trainer. The defaults follow the usual recipe for binary RBMs
/// (small random weights, mini-batches of tens, momentum 0.5 rising to 0.9, light L2 weight decay; common practice).
/// </summary>
public sealed record RbmTrainerSettings
{
    /// <summary>Hidden units.</summary>
    public int Hidden { get; init; } = 16;

    /// <summary>Passes over the training rows.</summary>
    public int Epochs { get; init; } = 100;

    /// <summary>Rows per parameter update.</summary>
    public int BatchSize { get; init; } = 20;

    /// <summary>Gibbs steps per update (the k of CD-k).</summary>
    public int CdSteps { get; init; } = 1;

    /// <summary>Step size on the per-row average gradient.</summary>
    public double LearningRate { get; init; } = 0.1;

    /// <summary>Momentum for the first <see cref="MomentumSwitchEpoch"/> epochs.</summary>
    public double InitialMomentum { get; init; } = 0.5;

    /// <summary>Momentum from epoch <see cref="MomentumSwitchEpoch"/> on.</summary>
    public double FinalMomentum { get; init; } = 0.9;

    /// <summary>The first epoch (0-based) using <see cref="FinalMomentum"/>.</summary>
    public int MomentumSwitchEpoch { get; init; } = 5;

    /// <summary>L2 weight decay on W (not on biases).</summary>
    public double WeightDecay { get; init; } = 1e-5;

    /// <summary>Initial weights are uniform in [-scale, scale].</summary>
    public double InitialWeightScale { get; init; } = 0.01;

    /// <summary>Seed of the trainer's SplitMix64 stream (initial weights, shuffling, Gibbs sampling).</summary>
    public ulong Seed { get; init; } = 1;
}
