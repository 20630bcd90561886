namespace Emit.Detection;

/// <summary>What a K-of-N filter did over one time-ordered log.</summary>
/// <param name="Rows">Reports in the log.</param>
/// <param name="Unusual">Reports with F &gt; threshold (the unfiltered decisions).</param>
/// <param name="Raised">Times the alarm was raised: reports where the filter is on and was off at the report
/// before.</param>
/// <param name="RowsInAlarm">Reports at which the filter is on.</param>
public sealed record AlarmFilterRun(long Rows, long Unusual, long Raised, long RowsInAlarm);
