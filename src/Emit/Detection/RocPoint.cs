namespace Emit.Detection;

/// <summary>
/// One point of a ROC curve: at threshold <see cref="Threshold"/> (unusual when F &gt; it), the false-alarm and
/// detection rates.
/// </summary>
public readonly record struct RocPoint(double Threshold, double FalseAlarmRate, double DetectionRate);
