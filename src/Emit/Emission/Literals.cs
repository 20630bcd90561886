using Emit.Quantize;
using System.Globalization;

namespace Emit.Emission;

/// <summary>
/// Numeric literals valid in both C99 and C#, that read back as exactly the value meant: binary32 values with 9
/// significant digits and an <c>f</c> suffix, binary64 values with 17 (IEEE 754-2008 §5.12.2, cited from memory:
/// 9 and 17 decimal digits are enough for any binary32 / binary64 value to round-trip; the tests check it against
/// the C compiler). Every literal has a decimal point or an
/// exponent (<c>1f</c> and <c>-0f</c> are not valid C).
/// </summary>
public static class Literals
{
    /// <summary>
    /// The value as the mode stores it (round to nearest even for f32); refuses values the mode cannot hold.
    /// </summary>
    public static double Round(double value, NumericMode mode, string what)
    {
        if (!double.IsFinite(value)) throw new EmitException($"{what} is not a finite number");
        if (mode == NumericMode.F32)
        {
            float f = (float)value;
            if (!float.IsFinite(f))
                throw new EmitException(
                    $"{what} = {value.ToString("R", CultureInfo.InvariantCulture)} does not fit in a 32-bit float",
                    $"use {Setting.Numeric.Ref()} f64");
            return f;
        }
        return value;
    }

    /// <summary>The literal of <paramref name="value"/> rounded to the mode.</summary>
    public static string Of(double value, NumericMode mode) => mode switch
    {
        NumericMode.F32 => Float((float)value),
        NumericMode.F64 => Double(value),
        _ => throw new ArgumentOutOfRangeException(nameof(mode), "float modes only"),
    };

    /// <summary>A binary32 literal: <c>0.100000001f</c>, <c>-0.0f</c>, <c>1.0f</c>, <c>1.00000001e-07f</c>.</summary>
    public static string Float(float value) =>
        WithPoint(Finite(value).ToString("G9", CultureInfo.InvariantCulture)) + "f";

    /// <summary>A binary64 literal: <c>0.10000000000000001</c>, <c>1.0</c>, <c>-2.5e-300</c>.</summary>
    public static string Double(double value) => WithPoint(Finite(value).ToString("G17", CultureInfo.InvariantCulture));

    /// <summary>
    /// The literal of the smallest value of the mode that is &gt;= <paramref name="value"/> (for bounds and
    /// tolerances, which must not shrink by rounding).
    /// </summary>
    public static string Upward(double value, NumericMode mode)
    {
        if (mode == NumericMode.F32)
        {
            float f = (float)value;
            if (f < value) f = MathF.BitIncrement(f);
            return Float(f);
        }
        return Double(value);
    }

    /// <summary>The value of <see cref="Upward"/> as a double.</summary>
    public static double UpwardValue(double value, NumericMode mode)
    {
        if (mode != NumericMode.F32) return value;
        float f = (float)value;
        if (f < value) f = MathF.BitIncrement(f);
        return f;
    }

    /// <summary>
    /// Guards every literal: C99 and C# have no literal for NaN or ±∞ (<c>NaN.0</c> or <c>Infinity.0</c> would not even
    /// compile), and a non-finite table entry or bound means an earlier check failed.
    /// </summary>
    private static T Finite<T>(T value) where T : System.Numerics.IFloatingPointIeee754<T> =>
        T.IsFinite(value) ? value
        : throw new EmitException(
            $"{value.ToString(null, CultureInfo.InvariantCulture)} cannot be written as a literal of generated code",
            "the model's values are too large for this numeric mode");

    private static string WithPoint(string text)
    {
        if (text.Contains('E'))
        {
            int e = text.IndexOf('E');
            var mantissa = text[..e];
            var exponent = text[(e + 1)..];
            return mantissa + "e" + exponent;
        }
        return text.Contains('.') ? text : text + ".0";
    }
}
