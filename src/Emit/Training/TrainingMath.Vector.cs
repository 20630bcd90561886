using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Emit.Training;

/// <summary>
/// The logistic function over a span, eight or four lanes at a time. Each lane does the very operations of the scalar
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
    /// <remarks>
    /// Two vectors per loop step: each exponential is a chain of 26 dependent operations, and two independent chains
    /// keep the floating-point units busy while each waits for its previous result. One division per lane: the scalar
    /// form divides 1 (x ≥ 0) or e^x (x &lt; 0) by 1 + e^-|x|, so the numerator is chosen first (docs/train.md,
    /// "Speed").
    /// </remarks>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static void Sigmoid(ReadOnlySpan<double> x, Span<double> destination)
    {
        if (destination.Length < x.Length)
            throw new ArgumentOutOfRangeException(nameof(destination), "destination is shorter than x");
        int k = 0;
        if (Vector512.IsHardwareAccelerated)
        {
            const int Lanes = 8; // Vector512<double>.Count
            for (; k <= x.Length - 2 * Lanes; k += 2 * Lanes)
            {
                var v0 = Vector512.Create(x.Slice(k, Lanes));
                var v1 = Vector512.Create(x.Slice(k + Lanes, Lanes));
                if (Special(v0) || Special(v1))
                {
                    for (int l = k; l < k + 2 * Lanes; l++) destination[l] = Sigmoid(x[l]);
                    continue;
                }
                var (z0, z1) = ExpNonPositive(-Vector512.Abs(v0), -Vector512.Abs(v1));
                Logistic(v0, z0).CopyTo(destination.Slice(k, Lanes));
                Logistic(v1, z1).CopyTo(destination.Slice(k + Lanes, Lanes));
            }
        }
        else if (Vector256.IsHardwareAccelerated)
        {
            const int Lanes = 4; // Vector256<double>.Count
            for (; k <= x.Length - Lanes; k += Lanes)
            {
                var v = Vector256.Create(x.Slice(k, Lanes));
                var t = -Vector256.Abs(v); // the scalar's argument: -x for x >= 0, x otherwise
                if (Vector256.LessThanAny(t, Vector256.Create(VectorExpLow)) || !Vector256.EqualsAll(v, v))
                {
                    for (int l = k; l < k + Lanes; l++) destination[l] = Sigmoid(x[l]);
                    continue;
                }
                var z = ExpNonPositive(t);
                var one = Vector256<double>.One;
                var s = Vector256.ConditionalSelect(Vector256.GreaterThanOrEqual(v, Vector256<double>.Zero), one, z)
                        / (one + z);
                s.CopyTo(destination.Slice(k, Lanes));
            }
        }
        for (; k < x.Length; k++) destination[k] = Sigmoid(x[k]);
    }

    /// <summary>True when a lane of <paramref name="v"/> is NaN or below -<see cref="VectorExpLow"/> in size.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static bool Special(Vector512<double> v) =>
        Vector512.LessThanAny(-Vector512.Abs(v), Vector512.Create(VectorExpLow)) || !Vector512.EqualsAll(v, v);

    /// <summary>
    /// The scalar's last step: 1 / (1 + z) where v ≥ 0, z / (1 + z) elsewhere, with z = e^-|v|.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector512<double> Logistic(Vector512<double> v, Vector512<double> z)
    {
        var one = Vector512<double>.One;
        return Vector512.ConditionalSelect(Vector512.GreaterThanOrEqual(v, Vector512<double>.Zero), one, z) / (one + z);
    }

    /// <summary>
    /// <see cref="Exp"/> lane by lane for two vectors of arguments in [<see cref="VectorExpLow"/>, 0] (2^n is then
    /// normal), the two Horner chains interleaved.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static (Vector512<double>, Vector512<double>) ExpNonPositive(Vector512<double> x0, Vector512<double> x1)
    {
        var half = Vector512.Create(0.5);
        var n0 = Vector512.Floor(x0 * InvLn2 + half);
        var n1 = Vector512.Floor(x1 * InvLn2 + half);
        var r0 = (x0 - n0 * Ln2Hi) - n0 * Ln2Lo;
        var r1 = (x1 - n1 * Ln2Hi) - n1 * Ln2Lo;
        var p0 = Vector512.Create(1.0 / 6227020800.0);    // 1/13!
        var p1 = p0;
        Step(ref p0, ref p1, r0, r1, 1.0 / 479001600.0);  // 1/12!
        Step(ref p0, ref p1, r0, r1, 1.0 / 39916800.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 3628800.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 362880.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 40320.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 5040.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 720.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 120.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 24.0);
        Step(ref p0, ref p1, r0, r1, 1.0 / 6.0);
        Step(ref p0, ref p1, r0, r1, 0.5);
        Step(ref p0, ref p1, r0, r1, 1.0);
        Step(ref p0, ref p1, r0, r1, 1.0);
        var bias = Vector512.Create(1023L);
        var s0 = Vector512.ShiftLeft(Vector512.ConvertToInt64(n0) + bias, 52).AsDouble();
        var s1 = Vector512.ShiftLeft(Vector512.ConvertToInt64(n1) + bias, 52).AsDouble();
        return (p0 * s0, p1 * s1);
    }

    /// <summary>One Horner step p ← p·r + c of both chains (a multiplication, then an addition: no fusing).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Step(ref Vector512<double> p0, ref Vector512<double> p1, Vector512<double> r0,
        Vector512<double> r1, double c)
    {
        var k = Vector512.Create(c);
        p0 = p0 * r0 + k;
        p1 = p1 * r1 + k;
    }

    /// <summary>
    /// <see cref="Exp"/> lane by lane for arguments in [<see cref="VectorExpLow"/>, 0] (2^n is then normal).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
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
