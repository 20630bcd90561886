namespace Emit.Detection;

/// <summary>One row of the table of conformal thresholds at the standard false-alarm rates.</summary>
/// <param name="FalseAlarm">The rate A.</param>
/// <param name="MinimumVectors">Normal vectors A needs.</param>
/// <param name="Threshold">The conformal threshold at A, or null when there are too few vectors.</param>
/// <param name="FalseAlarmRate">The rate of normal vectors above it (in the calibration set), or null.</param>
/// <param name="DetectionRate">The rate of anomalies above it, or null (no anomalies, or too few normal
/// vectors).</param>
public sealed record RateTableRow(double FalseAlarm, long MinimumVectors, double? Threshold, double? FalseAlarmRate,
    double? DetectionRate);
