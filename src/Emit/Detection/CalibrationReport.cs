using System.Diagnostics.CodeAnalysis;

namespace Emit.Detection;

/// <summary>
/// The result of <see cref="Calibrator.Run"/>: the threshold and everything that says how good it is.
/// </summary>
public sealed class CalibrationReport
{
    /// <summary>The threshold; a vector is unusual when F &gt; it.</summary>
    public required double Threshold { get; init; }

    /// <summary>
    /// "conformal" (the k-th smallest normal free energy) or "target_alarms_per_day" (searched on the log).
    /// </summary>
    public required string Method { get; init; }

    /// <summary>The false-alarm rate A asked for (conformal method), or null.</summary>
    public double? FalseAlarm { get; init; }

    /// <summary>
    /// The rank k = ⌈(n + 1)(1 − A)⌉ of the threshold among the normal free energies (conformal method), or null.
    /// </summary>
    public long? Rank { get; init; }

    /// <summary>n: normal vectors calibrated on.</summary>
    public required long NormalVectors { get; init; }

    /// <summary>Normal vectors with F &gt; threshold.</summary>
    public required long Flagged { get; init; }

    /// <summary>Flagged / NormalVectors.</summary>
    public double FalseAlarmRate => Flagged / (double)NormalVectors;

    /// <summary>
    /// The exact (Clopper–Pearson) interval of the true false-alarm rate, from Flagged of NormalVectors.
    /// </summary>
    public required RateInterval FalseAlarmInterval { get; init; }

    /// <summary>Warnings about the data (e.g. n·A &lt; 10); empty when there are none.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }

    /// <summary>Results on known anomalies, or null.</summary>
    public AnomalyResult? Anomalies { get; init; }

    /// <summary>Conformal thresholds at A = 0.1, 0.01, 0.001.</summary>
    public required IReadOnlyList<RateTableRow> RateTable { get; init; }

    /// <summary>The alarm filter over the normal log, or null.</summary>
    public FilterResult? Filter { get; init; }

    /// <summary>The anomaly episodes, or null.</summary>
    public EpisodeResult? Episodes { get; init; }

    /// <summary>The normal free energies in their original order (for plots).</summary>
    public required IReadOnlyList<double> NormalEnergies { get; init; }

    /// <summary>The anomalous free energies, or null.</summary>
    public IReadOnlyList<double>? AnomalyEnergies { get; init; }

    /// <summary>The caution that goes with every calibration.</summary>
    [SuppressMessage("Performance", "CA1822", Justification = "part of the report, read beside its other facts")]
    public string Caution => DetectionCaution.Text;
}
