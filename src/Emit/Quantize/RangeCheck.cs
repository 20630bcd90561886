namespace Emit.Quantize;

/// <summary>
/// One proof obligation: every value the named intermediate can take (over all binary inputs) lies in
/// <see cref="Range"/>, and the range lies in [−<see cref="Limit"/>, <see cref="Limit"/>].
/// </summary>
public readonly record struct RangeCheck(string Name, IntRange Range, long Limit)
{
    /// <summary>True when the range fits the limit.</summary>
    public bool Holds => Range.Within(Limit);
}
