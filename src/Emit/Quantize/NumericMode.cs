namespace Emit.Quantize;

/// <summary>The arithmetic a generated scorer uses.</summary>
public enum NumericMode
{
    /// <summary>IEEE 754 binary64 (<c>double</c>).</summary>
    F64,
    /// <summary>IEEE 754 binary32 (<c>float</c>).</summary>
    F32,
    /// <summary>Integer-only arithmetic with a proven error bound (docs/fixed-point.md).</summary>
    Fixed,
}

/// <summary>Text forms of <see cref="NumericMode"/> as used on the command line and in generated banners.</summary>
public static class NumericModeNames
{
    /// <summary>The mode's name: f32, f64 or fixed.</summary>
    public static string ToText(this NumericMode mode) => mode switch
    {
        NumericMode.F64 => "f64",
        NumericMode.F32 => "f32",
        NumericMode.Fixed => "fixed",
        _ => throw new ArgumentOutOfRangeException(nameof(mode)),
    };

    /// <summary>The mode named <paramref name="text"/>, or null for an unknown name.</summary>
    public static NumericMode? Parse(string text) => text switch
    {
        "f64" => NumericMode.F64,
        "f32" => NumericMode.F32,
        "fixed" => NumericMode.Fixed,
        _ => null,
    };

    /// <summary>True for the floating-point modes.</summary>
    public static bool IsFloat(this NumericMode mode) => mode is NumericMode.F64 or NumericMode.F32;
}
