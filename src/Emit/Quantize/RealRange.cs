namespace Emit.Quantize;

/// <summary>A closed range [<see cref="Min"/>, <see cref="Max"/>] of real values (nats or pre-activations).</summary>
public readonly record struct RealRange(double Min, double Max)
{
    /// <summary>Range of a sum of one value from each range.</summary>
    public static RealRange operator +(RealRange a, RealRange b) => new(a.Min + b.Min, a.Max + b.Max);

    /// <summary>Range of the negation.</summary>
    public static RealRange operator -(RealRange a) => new(-a.Max, -a.Min);

    /// <summary>True when x lies in the range.</summary>
    public bool Contains(double x) => x >= Min && x <= Max;

    /// <summary>Largest magnitude in the range.</summary>
    public double MaxAbs => Math.Max(Math.Abs(Min), Math.Abs(Max));

    /// <inheritdoc/>
    public override string ToString() =>
        string.Create(System.Globalization.CultureInfo.InvariantCulture, $"[{Min:G9}, {Max:G9}]");
}
