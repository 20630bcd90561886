using System.Runtime.Intrinsics;

namespace Emit.Training;

/// <summary>
/// The logistic function over a span, four lanes at a time. Each lane does the very operations of the scalar
/// <see cref="Sigmoid(double)"/> (same range reduction, same Horner steps, same constants, no fused multiply-add), so
/// every result is bit for bit the scalar one whatever the vector width; tests/Emit.Tests/Training/TrainingMathTests.cs
/// compares them bit for bit. System.Numerics.Tensors' TensorPrimitives.Sigmoid is not used: its exponential is a
/// different approximation whose last bits may differ between vector widths and platforms (its scalar tail calls
/// the C library's exp), and the trainer's output must be the same bits everywhere.
/// </summary>
public static partial class TrainingMath
{
    /// <summary>
    /// Below this argument the scalar exponential scales by a subnormal power of two (<see cref="Math.ScaleB"/>);
    /// lanes that low (and NaN lanes) take the scalar path.
    /// </summary>
    private const double VectorExpLow = -708.0;

    /// <summary>
    /// destination[k] = <see cref="Sigmoid(double)"/>(x[k]) for every k, bit for bit; x and destination may be the
    /// same span.
    /// </summary>
    public static void Sigmoid(ReadOnlySpan<double> x, Span<double> destination)
    {
        if (destination.Length < x.Length)
            throw new ArgumentOutOfRangeException(nameof(destination), "destination is shorter than x");
        int k = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            var low = Vector256.Create(VectorExpLow);
            var one = Vector256<double>.One;
            for (; k <= x.Length - Vector256<double>.Count; k += Vector256<double>.Count)
            {
                var v = Vector256.Create(x.Slice(k, Vector256<double>.Count));
                var t = -Vector256.Abs(v); // the scalar's argument: -x for x >= 0, x otherwise
                if (Vector256.LessThanAny(t, low) || !Vector256.EqualsAll(v, v))
                {
                    for (int l = k; l < k + Vector256<double>.Count; l++) destination[l] = Sigmoid(x[l]);
                    continue;
                }
                var z = ExpNonPositive(t);
                var s = Vector256.ConditionalSelect(Vector256.GreaterThanOrEqual(v, Vector256<double>.Zero),
                    one / (one + z), z / (one + z));
                s.CopyTo(destination.Slice(k, Vector256<double>.Count));
            }
        }
        for (; k < x.Length; k++) destination[k] = Sigmoid(x[k]);
    }

    /// <summary>
    /// <see cref="Exp"/> lane by lane for arguments in [<see cref="VectorExpLow"/>, 0] (2^n is then normal).
    /// </summary>
    private static Vector256<double> ExpNonPositive(Vector256<double> x)
    {
        var n = Vector256.Floor(x * InvLn2 + Vector256.Create(0.5));
        var r = (x - n * Ln2Hi) - n * Ln2Lo;
        var p = Vector256.Create(1.0 / 6227020800.0);
        p = p * r + Vector256.Create(1.0 / 479001600.0);
        p = p * r + Vector256.Create(1.0 / 39916800.0);
        p = p * r + Vector256.Create(1.0 / 3628800.0);
        p = p * r + Vector256.Create(1.0 / 362880.0);
        p = p * r + Vector256.Create(1.0 / 40320.0);
        p = p * r + Vector256.Create(1.0 / 5040.0);
        p = p * r + Vector256.Create(1.0 / 720.0);
        p = p * r + Vector256.Create(1.0 / 120.0);
        p = p * r + Vector256.Create(1.0 / 24.0);
        p = p * r + Vector256.Create(1.0 / 6.0);
        p = p * r + Vector256.Create(0.5);
        p = p * r + Vector256<double>.One;
        p = p * r + Vector256<double>.One;
        var scale = Vector256.ShiftLeft(Vector256.ConvertToInt64(n) + Vector256.Create(1023L), 52).AsDouble();
        return p * scale;
    }
}
