using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace Emit.Reference;

/// <summary>
/// softplus(x) = log(1 + e^x) on eight doubles at a time, and sums of it, from IEEE-754 additions,
/// multiplications and divisions only: no libm call, no fused multiply-add. The bits are therefore the same on
/// every platform, with or without AVX-512 (<see cref="Vector512{T}"/> runs as two 256-bit halves or in software
/// where 512-bit registers are missing), and independent of the C runtime's exp and log.
/// </summary>
/// <remarks>
/// softplus(x) = max(x, 0) + log1p(e^−|x|). e^y for y ≤ 0 is fdlibm's e_exp.c (Sun Microsystems, 1993; the same
/// code is in FreeBSD's msun and musl): y = k·ln2 + r, |r| ≤ ½ln2, with ln2 split in a 32-bit high part and a low
/// part so k·ln2_hi is exact; e^r = 1 + r + r·c/(2 − c), c = r − r²·P(r²), P of degree 4 (Remez, error below
/// 2^−59 on the range); the whole is stated to be within 1 ulp. 2^k is applied as two factors so results in the
/// subnormal range round once, like a libm. log1p(t) for t ∈ [0, 1] is fdlibm's s_log1p.c: for t ≤ √2 − 1, f = t;
/// above, u = 1 + t rounded is 2(1 + f) with f = u/2 − 1 exact, and c = (t − (u − 1))/u corrects the rounding; so
/// f ∈ [√2/2 − 1, √2 − 1] and log(1 + f) = f − ½f² + s·(½f² + R(s²)) with s = f/(2 + f) and R of degree 7 (error
/// below 2^−58.45), stated within 1 ulp. Measured: within 1 ulp of Math.Exp and of a compensated Math.Log, and
/// within 3 ulp of the libm-based <see cref="Softplus.Of"/> over the whole double range (VectorSoftplusTests;
/// docs/benchmarks.md).
/// </remarks>
public static class VectorSoftplus
{
    // fdlibm e_exp.c
    private const double Ln2Hi = 6.93147180369123816490e-01;  // 0x3fe62e42 fee00000
    private const double Ln2Lo = 1.90821492927058770002e-10;  // 0x3dea39ef 35793c76
    private const double InvLn2 = 1.44269504088896338700e+00; // 0x3ff71547 652b82fe
    private const double P1 = 1.66666666666666019037e-01;     // 0x3FC55555 5555553E
    private const double P2 = -2.77777777770155933842e-03;    // 0xBF66C16C 16BEBD93
    private const double P3 = 6.61375632143793436117e-05;     // 0x3F11566A AF25DE2C
    private const double P4 = -1.65339022054652515390e-06;    // 0xBEBBBD41 C5D26BF1
    private const double P5 = 4.13813679705723846039e-08;     // 0x3E663769 72BEA4D0

    // fdlibm s_log1p.c (Lp1..Lp7, the same values as e_log.c's Lg1..Lg7)
    private const double Lp1 = 6.666666666666735130e-01;      // 3FE55555 55555593
    private const double Lp2 = 3.999999999940941908e-01;      // 3FD99999 9997FA04
    private const double Lp3 = 2.857142874366239149e-01;      // 3FD24924 94229359
    private const double Lp4 = 2.222219843214978396e-01;      // 3FCC71C5 1D8E78AF
    private const double Lp5 = 1.818357216161805012e-01;      // 3FC74664 96CB03DE
    private const double Lp6 = 1.531383769920937332e-01;      // 3FC39A09 D078C69F
    private const double Lp7 = 1.479819860511658591e-01;      // 3FC2F112 DF3E5244

    // 1.5·2^52: adding it rounds a double of magnitude below 2^51 to an integer held in the low mantissa bits.
    private const double RoundMagic = 6755399441055744.0;

    // Below this e^y is below half the smallest subnormal and rounds to 0 (fdlibm: −745.13).
    private const double ExpFloor = -746.0;

    // fdlibm's bound 0x3FDA827A for taking f = t without reduction: √2 − 1 = 0.41421356...
    private const double Sqrt2M1 = 0.41421356237309503;

    /// <summary>Number of doubles in one vector step; sums keep this many partial sums whatever the hardware.</summary>
    public const int Lanes = 8;

    /// <summary>softplus(x) = log(1 + e^x) in each lane; ±∞ give +∞ and 0, NaN gives NaN.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector512<double> Of(Vector512<double> x)
    {
        var t = ExpNonPositive(-Vector512.Abs(x));
        var pos = Vector512.ConditionalSelect(Vector512.GreaterThan(x, Vector512<double>.Zero), x,
            Vector512<double>.Zero);
        var r = pos + Log1PUnit(t);
        return Vector512.ConditionalSelect(Vector512.Equals(x, x), r, x);
    }

    /// <summary>softplus of one double through the vector code (the bits of a lane of the vector overload).</summary>
    public static double Of(double x) => Of(Vector512.Create(x)).ToScalar();

    /// <summary>
    /// Σ_j softplus(x_j), kept as <see cref="Lanes"/> partial sums (lane l takes j ≡ l mod 8, in order) that are
    /// added pairwise at the end in a fixed order, so the result does not depend on the hardware's vector width.
    /// </summary>
    public static double Sum(ReadOnlySpan<double> x)
    {
        if (!Vector512.IsHardwareAccelerated && Vector256.IsHardwareAccelerated) return Sum256(x);
        var acc = Vector512<double>.Zero;
        ref double start = ref MemoryMarshal.GetReference(x);
        int n = x.Length, i = 0;
        for (; i <= n - Lanes; i += Lanes) acc += Of(Vector512.LoadUnsafe(ref start, (nuint)i));
        if (i < n)
        {
            Span<double> tail = stackalloc double[Lanes];
            tail.Clear();
            x[i..].CopyTo(tail);
            var mask = Vector512.LessThan(Vector512.Create(0L, 1, 2, 3, 4, 5, 6, 7), Vector512.Create((long)(n - i)));
            acc += Vector512.ConditionalSelect(mask.AsDouble(), Of(Vector512.Create<double>(tail)),
                Vector512<double>.Zero);
        }
        return Reduce(acc);
    }

    /// <summary>
    /// <see cref="Sum"/> where 512-bit vectors are not accelerated (AVX2 without AVX-512): the eight partial sums as
    /// two 256-bit vectors (lanes 0–3 and 4–7) and the same reduction order, so the bits are the same; Vector512
    /// emulated in software measured 2.8× slower on exact log Z (docs/benchmarks.md).
    /// </summary>
    private static double Sum256(ReadOnlySpan<double> x)
    {
        var low = Vector256<double>.Zero;
        var high = Vector256<double>.Zero;
        ref double start = ref MemoryMarshal.GetReference(x);
        int n = x.Length, i = 0;
        for (; i <= n - Lanes; i += Lanes)
        {
            low += Of(Vector256.LoadUnsafe(ref start, (nuint)i));
            high += Of(Vector256.LoadUnsafe(ref start, (nuint)(i + 4)));
        }
        if (i < n)
        {
            Span<double> tail = stackalloc double[Lanes];
            tail.Clear();
            x[i..].CopyTo(tail);
            var count = Vector256.Create((long)(n - i));
            var lowMask = Vector256.LessThan(Vector256.Create(0L, 1, 2, 3), count).AsDouble();
            var highMask = Vector256.LessThan(Vector256.Create(4L, 5, 6, 7), count).AsDouble();
            low += Vector256.ConditionalSelect(lowMask, Of(Vector256.Create<double>(tail)), Vector256<double>.Zero);
            high += Vector256.ConditionalSelect(highMask, Of(Vector256.Create<double>(tail[4..])),
                Vector256<double>.Zero);
        }
        var h = low + high;
        var q = h.GetLower() + h.GetUpper();
        return q.ToScalar() + q.GetElement(1);
    }

    /// <summary>softplus in each of four lanes: the arithmetic of the 512-bit overload, lane for lane.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Of(Vector256<double> x)
    {
        var t = ExpNonPositive(-Vector256.Abs(x));
        var pos = Vector256.ConditionalSelect(Vector256.GreaterThan(x, Vector256<double>.Zero), x,
            Vector256<double>.Zero);
        var r = pos + Log1PUnit(t);
        return Vector256.ConditionalSelect(Vector256.Equals(x, x), r, x);
    }

    /// <summary>Lanes added as ((0+4) + (2+6)) + ((1+5) + (3+7)), a fixed order.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Reduce(Vector512<double> v)
    {
        var h = v.GetLower() + v.GetUpper();
        var q = h.GetLower() + h.GetUpper();
        return q.ToScalar() + q.GetElement(1);
    }

    /// <summary>e^y for y ≤ 0 (fdlibm e_exp.c, within 1 ulp; subnormal results round once; below −746, 0).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static Vector512<double> ExpNonPositive(Vector512<double> y)
    {
        var floor = Vector512.Create(ExpFloor);
        y = Vector512.ConditionalSelect(Vector512.LessThan(y, floor), floor, y);
        var magic = Vector512.Create(RoundMagic);
        var shifted = y * Vector512.Create(InvLn2) + magic;
        var kd = shifted - magic;                                    // k = round(y / ln2), exactly an integer
        var k = shifted.AsInt64() - magic.AsInt64();                 // the same k as an integer, in [−1076, 0]
        var hi = y - kd * Vector512.Create(Ln2Hi);                   // exact: k·ln2_hi has at most 43 bits
        var lo = kd * Vector512.Create(Ln2Lo);
        var r = hi - lo;
        var rr = r * r;
        var c = r - rr * (Vector512.Create(P1) + rr * (Vector512.Create(P2) + rr * (Vector512.Create(P3)
            + rr * (Vector512.Create(P4) + rr * Vector512.Create(P5)))));
        var one = Vector512.Create(1.0);
        var p = one - ((lo - r * c / (Vector512.Create(2.0) - c)) - hi);   // e^r in [0.7, 1.42]
        // k = k1 + k2 with k1 = round(k/2) by the same rounding trick (no 64-bit arithmetic shift, which AVX2 lacks).
        var k1 = (kd * Vector512.Create(0.5) + magic).AsInt64() - magic.AsInt64();
        var k2 = k - k1;
        var bias = Vector512.Create(1023L);
        var s1 = Vector512.ShiftLeft(k1 + bias, 52).AsDouble();      // 2^k1 and 2^k2, both normal
        var s2 = Vector512.ShiftLeft(k2 + bias, 52).AsDouble();
        return p * s1 * s2;
    }

    /// <summary>log(1 + t) for t in [0, 1] (fdlibm s_log1p.c's argument reduction and kernel, within 1 ulp).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static Vector512<double> Log1PUnit(Vector512<double> t)
    {
        var one = Vector512.Create(1.0);
        var u = one + t;
        var big = Vector512.GreaterThan(t, Vector512.Create(Sqrt2M1));
        // Below √2 − 1, f = t exactly. Above, u = 2(1 + f) with f = u/2 − 1 exact, and c = (t − (u − 1))/u
        // (u − 1 is exact for u in [1, 2]) corrects the rounding of 1 + t.
        // c/u as c·½(1 − f + f² − f³) with f in [√2/2 − 1, 0]: |c| ≤ 2^−53, so the series' relative error f⁴
        // (about 1 %) moves the result by under 10^−18 and saves a division.
        var half = Vector512.Create(0.5);
        var f = Vector512.ConditionalSelect(big, u * half - one, t);
        var inv = half * (one - f * (one - f * (one - f)));
        var c = Vector512.ConditionalSelect(big, (t - (u - one)) * inv, Vector512<double>.Zero);
        var dk = Vector512.ConditionalSelect(big, one, Vector512<double>.Zero);
        var hfsq = half * f * f;
        var s = f / (Vector512.Create(2.0) + f);
        var z = s * s;
        var w = z * z;
        var t1 = w * (Vector512.Create(Lp2) + w * (Vector512.Create(Lp4) + w * Vector512.Create(Lp6)));
        var t2 = z * (Vector512.Create(Lp1) + w * (Vector512.Create(Lp3) + w * (Vector512.Create(Lp5)
            + w * Vector512.Create(Lp7))));
        var rr = t2 + t1;
        return dk * Vector512.Create(Ln2Hi)
            - ((hfsq - (s * (hfsq + rr) + (dk * Vector512.Create(Ln2Lo) + c))) - f);
    }

    /// <summary>The 256-bit twin of the 512-bit overload above, lane for lane the same operations.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static Vector256<double> ExpNonPositive(Vector256<double> y)
    {
        var floor = Vector256.Create(ExpFloor);
        y = Vector256.ConditionalSelect(Vector256.LessThan(y, floor), floor, y);
        var magic = Vector256.Create(RoundMagic);
        var shifted = y * Vector256.Create(InvLn2) + magic;
        var kd = shifted - magic;                                    // k = round(y / ln2), exactly an integer
        var k = shifted.AsInt64() - magic.AsInt64();                 // the same k as an integer, in [−1076, 0]
        var hi = y - kd * Vector256.Create(Ln2Hi);                   // exact: k·ln2_hi has at most 43 bits
        var lo = kd * Vector256.Create(Ln2Lo);
        var r = hi - lo;
        var rr = r * r;
        var c = r - rr * (Vector256.Create(P1) + rr * (Vector256.Create(P2) + rr * (Vector256.Create(P3)
            + rr * (Vector256.Create(P4) + rr * Vector256.Create(P5)))));
        var one = Vector256.Create(1.0);
        var p = one - ((lo - r * c / (Vector256.Create(2.0) - c)) - hi);   // e^r in [0.7, 1.42]
        // k = k1 + k2 with k1 = round(k/2) by the same rounding trick (no 64-bit arithmetic shift, which AVX2 lacks).
        var k1 = (kd * Vector256.Create(0.5) + magic).AsInt64() - magic.AsInt64();
        var k2 = k - k1;
        var bias = Vector256.Create(1023L);
        var s1 = Vector256.ShiftLeft(k1 + bias, 52).AsDouble();      // 2^k1 and 2^k2, both normal
        var s2 = Vector256.ShiftLeft(k2 + bias, 52).AsDouble();
        return p * s1 * s2;
    }

    /// <summary>The 256-bit twin of the 512-bit overload above, lane for lane the same operations.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static Vector256<double> Log1PUnit(Vector256<double> t)
    {
        var one = Vector256.Create(1.0);
        var u = one + t;
        var big = Vector256.GreaterThan(t, Vector256.Create(Sqrt2M1));
        // Below √2 − 1, f = t exactly. Above, u = 2(1 + f) with f = u/2 − 1 exact, and c = (t − (u − 1))/u
        // (u − 1 is exact for u in [1, 2]) corrects the rounding of 1 + t.
        // c/u as c·½(1 − f + f² − f³) with f in [√2/2 − 1, 0]: |c| ≤ 2^−53, so the series' relative error f⁴
        // (about 1 %) moves the result by under 10^−18 and saves a division.
        var half = Vector256.Create(0.5);
        var f = Vector256.ConditionalSelect(big, u * half - one, t);
        var inv = half * (one - f * (one - f * (one - f)));
        var c = Vector256.ConditionalSelect(big, (t - (u - one)) * inv, Vector256<double>.Zero);
        var dk = Vector256.ConditionalSelect(big, one, Vector256<double>.Zero);
        var hfsq = half * f * f;
        var s = f / (Vector256.Create(2.0) + f);
        var z = s * s;
        var w = z * z;
        var t1 = w * (Vector256.Create(Lp2) + w * (Vector256.Create(Lp4) + w * Vector256.Create(Lp6)));
        var t2 = z * (Vector256.Create(Lp1) + w * (Vector256.Create(Lp3) + w * (Vector256.Create(Lp5)
            + w * Vector256.Create(Lp7))));
        var rr = t2 + t1;
        return dk * Vector256.Create(Ln2Hi)
            - ((hfsq - (s * (hfsq + rr) + (dk * Vector256.Create(Ln2Lo) + c))) - f);
    }
}
