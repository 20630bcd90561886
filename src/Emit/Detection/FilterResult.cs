namespace Emit.Detection;

/// <summary>A K-of-N filter over the normal log at the calibrated threshold.</summary>
/// <param name="Filter">The filter.</param>
/// <param name="Run">What it did.</param>
/// <param name="PerThousandRows">Raised alarms per 1000 rows.</param>
/// <param name="PerThousandRowsInterval">Its exact interval (binomial model, see <see cref="Calibrator"/>).</param>
/// <param name="SamplePeriodSeconds">Seconds between rows, or null.</param>
/// <param name="PerDay">Raised alarms per day, or null without a sample period.</param>
/// <param name="PerDayInterval">Its exact interval, or null.</param>
/// <param name="TargetPerDay">The target the threshold was searched for, or null.</param>
public sealed record FilterResult(
    AlarmFilterSpec Filter,
    AlarmFilterRun Run,
    double PerThousandRows,
    RateInterval PerThousandRowsInterval,
    double? SamplePeriodSeconds,
    double? PerDay,
    RateInterval? PerDayInterval,
    double? TargetPerDay);
