using System.Collections.Immutable;
using Emit.Model;

namespace Emit.Training;

/// <summary>
/// A trained model (no threshold, no metadata) with the epoch reports, the epoch kept (the best validation epoch
/// with validation rows, else the last), and the units that were constant in the training rows.
/// </summary>
public sealed record TrainingResult(
    BoltzmannModel Model,
    ImmutableArray<EpochReport> Epochs,
    int EpochKept,
    bool StoppedEarly,
    ImmutableArray<int> ConstantUnits)
{
    /// <summary>The report of the epoch kept, or null when no epoch ran.</summary>
    public EpochReport? Kept => EpochKept >= 1 ? Epochs[EpochKept - 1] : null;
}
