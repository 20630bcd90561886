namespace Emit.Quantize;

/// <summary>
/// A closed interval [<see cref="Lo"/>, <see cref="Hi"/>] of real numbers, used for signed error terms
/// (approximation − exact) in nats. Sums of intervals are sound bounds of sums of the errors.
/// </summary>
public readonly record struct ErrorInterval(double Lo, double Hi)
{
    /// <summary>[0, 0].</summary>
    public static ErrorInterval Zero => new(0, 0);

    /// <summary>The empty interval (identity of <see cref="Hull"/>).</summary>
    public static ErrorInterval Empty => new(double.PositiveInfinity, double.NegativeInfinity);

    /// <summary>True for <see cref="Empty"/>.</summary>
    public bool IsEmpty => Lo > Hi;

    /// <summary>max(|Lo|, |Hi|): the worst absolute error.</summary>
    public double MaxAbs => IsEmpty ? 0 : Math.Max(Math.Abs(Lo), Math.Abs(Hi));

    /// <summary>Hi − Lo.</summary>
    public double Width => IsEmpty ? 0 : Hi - Lo;

    /// <summary>(Lo + Hi) / 2.</summary>
    public double Mid => IsEmpty ? 0 : 0.5 * (Lo + Hi);

    /// <summary>Interval sum.</summary>
    public static ErrorInterval operator +(ErrorInterval a, ErrorInterval b) =>
        a.IsEmpty ? b : b.IsEmpty ? a : new(a.Lo + b.Lo, a.Hi + b.Hi);

    /// <summary>Negation: [−Hi, −Lo].</summary>
    public static ErrorInterval operator -(ErrorInterval a) => a.IsEmpty ? a : new(-a.Hi, -a.Lo);

    /// <summary>Scaling by a non-negative constant.</summary>
    public static ErrorInterval operator *(double k, ErrorInterval a) => a.IsEmpty ? a : new(k * a.Lo, k * a.Hi);

    /// <summary>Smallest interval holding both.</summary>
    public ErrorInterval Hull(ErrorInterval other) =>
        IsEmpty ? other : other.IsEmpty ? this : new(Math.Min(Lo, other.Lo), Math.Max(Hi, other.Hi));

    /// <summary>Interval product with another interval (all four corner products).</summary>
    public ErrorInterval Times(ErrorInterval other)
    {
        if (IsEmpty || other.IsEmpty) return Empty;
        double a = Lo * other.Lo, b = Lo * other.Hi, c = Hi * other.Lo, d = Hi * other.Hi;
        return new(Math.Min(Math.Min(a, b), Math.Min(c, d)), Math.Max(Math.Max(a, b), Math.Max(c, d)));
    }

    /// <summary>[min(0, Lo), max(0, Hi)]: the interval joined with zero.</summary>
    public ErrorInterval WithZero() => IsEmpty ? Zero : new(Math.Min(0, Lo), Math.Max(0, Hi));

    /// <summary>[Lo, Hi] shifted by a constant.</summary>
    public ErrorInterval Shift(double k) => IsEmpty ? this : new(Lo + k, Hi + k);

    /// <inheritdoc/>
    public override string ToString() =>
        string.Create(System.Globalization.CultureInfo.InvariantCulture, $"[{Lo:G6}, {Hi:G6}]");
}
