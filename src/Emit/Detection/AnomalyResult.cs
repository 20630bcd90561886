namespace Emit.Detection;

/// <summary>How the threshold does on known anomalous vectors.</summary>
/// <param name="Vectors">Anomalous vectors given.</param>
/// <param name="Detected">Those with F &gt; threshold.</param>
/// <param name="DetectionRate">Detected / Vectors.</param>
/// <param name="DetectionInterval">The exact interval of the detection rate.</param>
/// <param name="RocAuc">Area under the ROC curve of normal against anomalous free energies, ties counted half.</param>
public sealed record AnomalyResult(long Vectors, long Detected, double DetectionRate, RateInterval DetectionInterval,
    double RocAuc);
