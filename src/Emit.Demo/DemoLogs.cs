using System.Collections.Immutable;

namespace Emit.Demo;

/// <summary>The four logs of the demo scenario, each drawn from its own stream of the master seed.</summary>
/// <param name="Training">Normal reports the model is trained on.</param>
/// <param name="Calibration">Held-out normal reports the threshold is calibrated on.</param>
/// <param name="Normal">A fresh normal sample (normal.csv), used neither for training nor calibration.</param>
/// <param name="Faulty">Faulty reports (faulty.csv), each with its fault and base mode.</param>
public sealed record DemoLogs(
    ImmutableArray<ReeferRow> Training,
    ImmutableArray<ReeferRow> Calibration,
    ImmutableArray<ReeferRow> Normal,
    ImmutableArray<ReeferRow> Faulty);
