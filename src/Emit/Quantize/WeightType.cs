namespace Emit.Quantize;

/// <summary>Storage type of the quantized visible-hidden and lateral weights in fixed-point mode.</summary>
public enum WeightType
{
    /// <summary>int8_t / sbyte, values in [−127, 127].</summary>
    Int8,
    /// <summary>int16_t / short, values in [−32767, 32767].</summary>
    Int16,
    /// <summary>int32_t / int, values in [−2147483647, 2147483647].</summary>
    Int32,
}

/// <summary>Names and limits of <see cref="WeightType"/>.</summary>
public static class WeightTypeInfo
{
    /// <summary>Width in bits.</summary>
    public static int Bits(this WeightType type) => type switch
    {
        WeightType.Int8 => 8,
        WeightType.Int16 => 16,
        WeightType.Int32 => 32,
        _ => throw new ArgumentOutOfRangeException(nameof(type)),
    };

    /// <summary>
    /// Largest magnitude a quantized weight may take: 2^(bits−1) − 1. The range is symmetric (the most negative
    /// two's-complement value is never used), so negating a weight can never overflow (common practice in
    /// symmetric quantization).
    /// </summary>
    public static long MaxMagnitude(this WeightType type) => (1L << (type.Bits() - 1)) - 1;

    /// <summary>Option text: int8, int16, int32.</summary>
    public static string ToText(this WeightType type) => "int" + type.Bits();

    /// <summary>Parses int8, int16 or int32; null otherwise.</summary>
    public static WeightType? Parse(string text) => text switch
    {
        "int8" => WeightType.Int8,
        "int16" => WeightType.Int16,
        "int32" => WeightType.Int32,
        _ => null,
    };
}
