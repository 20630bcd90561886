namespace Emit.Training;

/// <summary>
/// Exponential, logarithm and logistic function from additions, multiplications, divisions and exact
/// power-of-two scaling only. <see cref="Math.Exp"/> and <see cref="Math.Log(double)"/> call the platform's C library,
/// whose last bit may differ between operating systems; the trainer uses these instead so a committed
/// model is the same bits everywhere. Accurate to a few units in the last place, which is all training needs.
/// </summary>
public static class TrainingMath
{
    // ln 2 split so that n * Ln2Hi is exact for |n| < 2^11 (the split used by fdlibm's exp and log).
    private const double Ln2Hi = 6.93147180369123816490e-01;
    private const double Ln2Lo = 1.90821492927058770002e-10;
    private const double InvLn2 = 1.44269504088896338700e+00;
    private const double Sqrt2 = 1.41421356237309504880;

    /// <summary>
    /// e^x. Range reduction x = n ln2 + r, |r| &lt;= ln2/2 (about), then the Taylor series to degree 13 by Horner's
    /// rule.
    /// </summary>
    public static double Exp(double x)
    {
        if (double.IsNaN(x)) return x;
        if (x > 709.782712893384) return double.PositiveInfinity;
        if (x < -745.1332191019412) return 0.0;
        double n = Math.Floor(x * InvLn2 + 0.5);
        double r = (x - n * Ln2Hi) - n * Ln2Lo;
        double p = 1.0 / 6227020800.0;                // 1/13!
        p = p * r + 1.0 / 479001600.0;                 // 1/12!
        p = p * r + 1.0 / 39916800.0;
        p = p * r + 1.0 / 3628800.0;
        p = p * r + 1.0 / 362880.0;
        p = p * r + 1.0 / 40320.0;
        p = p * r + 1.0 / 5040.0;
        p = p * r + 1.0 / 720.0;
        p = p * r + 1.0 / 120.0;
        p = p * r + 1.0 / 24.0;
        p = p * r + 1.0 / 6.0;
        p = p * r + 0.5;
        p = p * r + 1.0;
        p = p * r + 1.0;
        int e = (int)n;
        // 2^e built from its bits when it is a normal number (exact either way); ScaleB for the subnormal tail.
        return e > -1022 && e < 1024 ? p * BitConverter.Int64BitsToDouble((long)(e + 1023) << 52) : Math.ScaleB(p, e);
    }

    /// <summary>
    /// Natural logarithm of a positive finite x. x = m 2^e with m in [sqrt(1/2), sqrt(2)), then
    /// log m = 2 atanh(s), s = (m-1)/(m+1), |s| &lt;= 0.172, by its odd series to s^25.
    /// </summary>
    public static double Log(double x)
    {
        if (!(x > 0) || double.IsInfinity(x))
            throw new ArgumentOutOfRangeException(nameof(x), x, "Log needs a positive finite number");
        int e = Math.ILogB(x);
        double m = Math.ScaleB(x, -e); // [1, 2), exact
        if (m > Sqrt2) { m *= 0.5; e++; }
        double s = (m - 1.0) / (m + 1.0);
        double s2 = s * s;
        double q = 1.0 / 25.0;
        for (int k = 23; k >= 3; k -= 2) q = q * s2 + 1.0 / k;
        q = q * s2 + 1.0;
        return e * Ln2Hi + (2.0 * s * q + e * Ln2Lo);
    }

    /// <summary>The logistic function 1 / (1 + e^-x), without overflow for large |x|.</summary>
    public static double Sigmoid(double x)
    {
        if (x >= 0) return 1.0 / (1.0 + Exp(-x));
        double z = Exp(x);
        return z / (1.0 + z);
    }
}
