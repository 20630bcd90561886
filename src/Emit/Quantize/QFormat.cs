namespace Emit.Quantize;

/// <summary>
/// A binary fixed-point format in Q notation: an integer q of <see cref="TotalBits"/> bits stands for the real
/// number q / 2^<see cref="FractionBits"/>. "Qm.n" (signed) has m integer bits, n fraction bits and one sign bit,
/// m + n + 1 = total; "UQm.n" (unsigned) has m + n = total. m may be negative when n exceeds the width (tiny
/// values), as in "Q-2.17". (Q notation: common practice in DSP libraries, e.g. q15/q31 types.)
/// </summary>
public readonly record struct QFormat(int TotalBits, int FractionBits, bool Signed = true)
{
    /// <summary>Integer bits m (sign bit excluded).</summary>
    public int IntegerBits => TotalBits - FractionBits - (Signed ? 1 : 0);

    /// <summary>Value of one least significant bit: 2^−n.</summary>
    public double Lsb => Math.ScaleB(1.0, -FractionBits);

    /// <summary>The format as text ("Q15.16"), for templates.</summary>
    public string Text => ToString();

    /// <summary>"Qm.n" or "UQm.n".</summary>
    public override string ToString() =>
        (Signed ? "Q" : "UQ") + IntegerBits.ToString(System.Globalization.CultureInfo.InvariantCulture) + "." +
        FractionBits.ToString(System.Globalization.CultureInfo.InvariantCulture);
}
