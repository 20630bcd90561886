namespace Emit.Reference;

/// <summary>Numerically stable softplus, log1p and log-sum-exp in double precision.</summary>
public static class Softplus
{
    /// <summary>
    /// softplus(x) = log(1 + e^x), with the log1pexp cut-offs of Mächler (2012), "Accurately computing
    /// log(1 - exp(-|a|))", eq. (10): x &lt;= -37: e^x; x &lt;= 18: log1p(e^x); x &lt;= 33.3: x + e^-x; else x.
    /// </summary>
    public static double Of(double x)
    {
        if (x <= -37.0) return Math.Exp(x);
        if (x <= 18.0) return Log1P(Math.Exp(x));
        if (x <= 33.3) return x + Math.Exp(-x);
        return x;
    }

    /// <summary>
    /// log(1 + x) accurate for small |x|: with u = 1 + x rounded, log(u)·x/(u − 1) (Goldberg 1991, "What every
    /// computer scientist should know about floating-point arithmetic", Theorem 4). The BCL's LogP1 is log(x + 1).
    /// </summary>
    public static double Log1P(double x)
    {
        double u = 1.0 + x;
        if (u == 1.0) return x;
        if (double.IsPositiveInfinity(u)) return u;
        return Math.Log(u) * x / (u - 1.0);
    }

    /// <summary>The logistic function 1/(1 + e^-x), the derivative of softplus.</summary>
    public static double Sigmoid(double x) => x >= 0 ? 1.0 / (1.0 + Math.Exp(-x)) : Math.Exp(x) / (1.0 + Math.Exp(x));
}
