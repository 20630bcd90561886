namespace Emit.Quantize;

/// <summary>
/// A closed range [<see cref="Min"/>, <see cref="Max"/>] of integers, computed with 128-bit arithmetic so that the
/// analysis itself cannot overflow while it decides whether a 32- or 64-bit accumulator suffices.
/// </summary>
public readonly record struct IntRange(Int128 Min, Int128 Max)
{
    /// <summary>The single value v.</summary>
    public static IntRange Point(Int128 v) => new(v, v);

    /// <summary>Range of a sum of one value from each range.</summary>
    public static IntRange operator +(IntRange a, IntRange b) => new(a.Min + b.Min, a.Max + b.Max);

    /// <summary>Range of the negation.</summary>
    public static IntRange operator -(IntRange a) => new(-a.Max, -a.Min);

    /// <summary>Range of a product by a non-negative constant.</summary>
    public static IntRange operator *(Int128 k, IntRange a) =>
        k >= 0 ? new(k * a.Min, k * a.Max) : throw new ArgumentOutOfRangeException(nameof(k));

    /// <summary>Smallest range holding both.</summary>
    public IntRange Hull(IntRange other) => new(Int128.Min(Min, other.Min), Int128.Max(Max, other.Max));

    /// <summary>Largest magnitude in the range.</summary>
    public Int128 MaxAbs => Int128.Max(Int128.Abs(Min), Int128.Abs(Max));

    /// <summary>True when every value lies in [−limit, limit].</summary>
    public bool Within(long limit) => Min >= -limit && Max <= limit;

    /// <inheritdoc/>
    public override string ToString() => $"[{Min}, {Max}]";
}
