namespace Emit.Detection;

/// <summary>
/// What <see cref="Calibrator.Run"/> calibrates from: free energies already computed by the reference scorer.
/// </summary>
public sealed class CalibrationRequest
{
    /// <summary>
    /// Free energies of the normal vectors, in file order (time order when a filter is run over them).
    /// </summary>
    public required IReadOnlyList<double> Normal { get; init; }

    /// <summary>
    /// The false-alarm rate A for the conformal threshold; null when <see cref="TargetAlarmsPerDay"/> sets it instead.
    /// </summary>
    public double? FalseAlarm { get; init; }

    /// <summary>Free energies of known anomalous vectors, or null.</summary>
    public IReadOnlyList<double>? Anomalies { get; init; }

    /// <summary>A K-of-N filter to run over the normal log (and the episodes), or null.</summary>
    public AlarmFilterSpec? Filter { get; init; }

    /// <summary>Seconds between rows of the normal log, or null (then no rates per day).</summary>
    public double? SamplePeriodSeconds { get; init; }

    /// <summary>
    /// Search the threshold so that <see cref="Filter"/> raises at most this many alarms per day on the normal log.
    /// </summary>
    public double? TargetAlarmsPerDay { get; init; }

    /// <summary>Time-ordered anomaly episodes (free energies per episode), or null.</summary>
    public IReadOnlyList<IReadOnlyList<double>>? Episodes { get; init; }

    /// <summary>A name per episode (e.g. its file name), or null.</summary>
    public IReadOnlyList<string>? EpisodeNames { get; init; }

    /// <summary>Confidence level of every interval.</summary>
    public double Confidence { get; init; } = ClopperPearson.DefaultConfidence;
}
