namespace Emit.Quantize;

/// <summary>
/// The one rounding rule of the fixed-point mode: round half away from zero, both when constants are
/// quantized (in C#, here) and when the generated code drops fraction bits at run time.
/// </summary>
public static class FixedRounding
{
    /// <summary>
    /// round_half_away_from_zero(x · 2^fractionBits). The scaling by a power of two is exact in binary floating
    /// point (barring overflow), so this is the exact rounding of the real product.
    /// </summary>
    public static Int128 Quantize(double x, int fractionBits)
    {
        double scaled = Math.ScaleB(x, fractionBits);
        if (!double.IsFinite(scaled) || Math.Abs(scaled) > 1e36)
            throw new OverflowException($"{x} · 2^{fractionBits} is too large to quantize");
        return (Int128)Math.Round(scaled, MidpointRounding.AwayFromZero);
    }

    /// <summary>
    /// The run-time rescaling helper <c>to_energy(x, s)</c>, with s = source fraction bits − target fraction bits.
    /// s &gt; 0 drops s bits, rounding half away from zero without shifting a negative value:
    /// x ≥ 0: (x + 2^(s−1)) &gt;&gt; s; x &lt; 0: −((−x + 2^(s−1)) &gt;&gt; s).
    /// s ≤ 0 multiplies by 2^−s (a multiplication, never a left shift of a possibly negative value).
    /// The caller guarantees the intermediate values fit (the plan's range analysis proves it).
    /// </summary>
    public static Int128 Rescale(Int128 x, int s)
    {
        if (s <= 0) return x * ((Int128)1 << -s);
        Int128 half = (Int128)1 << (s - 1);
        return x >= 0 ? (x + half) >> s : -((-x + half) >> s);
    }

    /// <summary>
    /// Range of (rounded − exact) for dropping s bits of a non-negative integer with
    /// (x + 2^(s−1)) &gt;&gt; s, in units of the result's LSB: [−(2^(s−1) − 1)/2^s, 1/2]; [0, 0] when s ≤ 0.
    /// For a negative x the helper mirrors it: [−1/2, (2^(s−1) − 1)/2^s].
    /// </summary>
    public static ErrorInterval DropBitsError(int s, bool nonNegative)
    {
        if (s <= 0) return ErrorInterval.Zero;
        double lo = -(Math.ScaleB(1.0, s - 1) - 1) / Math.ScaleB(1.0, s);
        return nonNegative ? new ErrorInterval(lo, 0.5) : new ErrorInterval(-0.5, -lo);
    }
}
