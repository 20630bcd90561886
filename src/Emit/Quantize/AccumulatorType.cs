namespace Emit.Quantize;

/// <summary>Width of every accumulator and intermediate value in the fixed-point scorer.</summary>
public enum AccumulatorType
{
    /// <summary>int32_t / int.</summary>
    Int32,
    /// <summary>int64_t / long.</summary>
    Int64,
}

/// <summary>Names and limits of <see cref="AccumulatorType"/>.</summary>
public static class AccumulatorTypeInfo
{
    /// <summary>Width in bits.</summary>
    public static int Bits(this AccumulatorType type) => type == AccumulatorType.Int32 ? 32 : 64;

    /// <summary>
    /// Largest magnitude any intermediate may reach: 2^(bits−1) − 1. The analysis keeps every value in
    /// [−Max, Max], so negation and absolute value never overflow either.
    /// </summary>
    public static long MaxMagnitude(this AccumulatorType type) =>
        type == AccumulatorType.Int32 ? int.MaxValue : long.MaxValue;

    /// <summary>Option text: int32, int64.</summary>
    public static string ToText(this AccumulatorType type) => "int" + type.Bits();

    /// <summary>Parses int32 or int64; null otherwise (the option value "auto" is handled by the caller).</summary>
    public static AccumulatorType? Parse(string text) => text switch
    {
        "int32" => AccumulatorType.Int32,
        "int64" => AccumulatorType.Int64,
        _ => null,
    };
}
