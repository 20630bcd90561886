using System.Collections.Immutable;
using System.Numerics;
using Emit.Reference;

namespace Emit.Quantize;

/// <summary>
/// The integer table behind softplus and log-sum-exp: G(d) = log1p(exp(−d)) = softplus(−d) tabulated on [0, R],
/// R = 2^ρ, in N segments of width h = R/N = 2^−e, N + 1 entries T[k] = round_half_away(G(k·h) · 2^E)
/// (non-increasing, T[0] = round(ln 2 · 2^E)). The scorer uses softplus(x) = max(x, 0) + G(|x|) and
/// log(e^a + e^b) = max(a, b) + G(|a − b|); G is interpolated linearly in integers and taken as 0 for d ≥ R
/// (error at most G(R) &lt; e^−R). Lookup arithmetic: docs/fixed-point.md and <see cref="FixedPointSimulator"/>.
/// </summary>
public sealed class SoftplusTable
{
    private readonly double[] _entryError;   // T[k] − G(k·h)·2^E, in LSB
    private readonly double[] _interpBound;  // h²/8 · max G'' over segment k, in nats

    /// <summary>Builds the table. <paramref name="segments"/> is a power of two ≥ 2.</summary>
    public SoftplusTable(int segments, int rangeLog2, int fractionBits)
    {
        if (segments < 2 || !BitOperations.IsPow2(segments)) throw new ArgumentOutOfRangeException(nameof(segments));
        Segments = segments;
        RangeLog2 = rangeLog2;
        FractionBits = fractionBits;
        StepFractionBits = BitOperations.Log2((uint)segments) - rangeLog2;
        var entries = ImmutableArray.CreateBuilder<long>(segments + 1);
        _entryError = new double[segments + 1];
        for (int k = 0; k <= segments; k++)
        {
            double g = G(Node(k));
            Int128 t = FixedRounding.Quantize(g, fractionBits);
            if (t > int.MaxValue) throw new OverflowException("table entry exceeds int32");
            entries.Add((long)t);
            _entryError[k] = (double)(long)t - Math.ScaleB(g, fractionBits);
        }
        Entries = entries.MoveToImmutable();
        _interpBound = new double[segments];
        double h2 = Step * Step;
        long maxStep = 0;
        for (int k = 0; k < segments; k++)
        {
            _interpBound[k] = h2 / 8.0 * MaxCurvature(Node(k), Node(k + 1));
            long step = Entries[k] - Entries[k + 1];
            if (step < 0) throw new InvalidOperationException("table is not monotone");
            maxStep = Math.Max(maxStep, step);
        }
        MaxEntryStep = maxStep;
        EntryFormat = Entries[0] <= ushort.MaxValue ? new QFormat(16, fractionBits, Signed: false)
            : new QFormat(32, fractionBits);
    }

    /// <summary>G(d) = log1p(exp(−d)) = softplus(−d) in double precision.</summary>
    public static double G(double d) => Softplus.Of(-d);

    /// <summary>Number of segments N (entries: N + 1).</summary>
    public int Segments { get; }

    /// <summary>ρ: the table covers d ∈ [0, 2^ρ].</summary>
    public int RangeLog2 { get; }

    /// <summary>R = 2^ρ.</summary>
    public double Range => Math.ScaleB(1.0, RangeLog2);

    /// <summary>e: the segment width is h = 2^−e = R/N.</summary>
    public int StepFractionBits { get; }

    /// <summary>h = 2^−e.</summary>
    public double Step => Math.ScaleB(1.0, -StepFractionBits);

    /// <summary>E: entries are in units of 2^−E (the energy format).</summary>
    public int FractionBits { get; }

    /// <summary>T[0..N], non-increasing.</summary>
    public ImmutableArray<long> Entries { get; }

    /// <summary>
    /// Storage format of an entry: UQ(16−E).E when every entry fits 16 bits unsigned, else Q(31−E).E.
    /// </summary>
    public QFormat EntryFormat { get; }

    /// <summary>Bytes of the table in the generated code.</summary>
    public int Bytes => (Segments + 1) * EntryFormat.TotalBits / 8;

    /// <summary>max_k T[k] − T[k+1] (≥ 0).</summary>
    public long MaxEntryStep { get; }

    /// <summary>d_k = k·h.</summary>
    public double Node(int k) => k * Step;

    /// <summary>T[k] − G(d_k)·2^E, in LSB (|·| ≤ 1/2).</summary>
    public double EntryError(int k) => _entryError[k];

    /// <summary>
    /// Bound on the linear-interpolation error over segment k: h²/8 · max over the segment of G''(d), with
    /// G''(d) = σ(d)(1 − σ(d)) ≤ 1/4 (σ the logistic function). The interpolation error theorem gives
    /// f(x) − p(x) = f''(ξ)/2 · (x − x_k)(x − x_{k+1}) for some ξ in the segment (Burden &amp; Faires, Numerical
    /// Analysis, chapter "Interpolation and Polynomial Approximation", Lagrange interpolation error theorem;
    /// cited from memory), and |(x − x_k)(x − x_{k+1})| ≤ h²/4. G is convex, so the interpolant is never below
    /// it: p − G ∈ [0, this bound].
    /// </summary>
    public double InterpolationBound(int k) => _interpBound[k];

    /// <summary>
    /// max of σ(x)(1 − σ(x)) over [a, b]: 1/4 if the interval holds 0, else its value at the end nearer 0.
    /// </summary>
    public static double MaxCurvature(double a, double b)
    {
        if (a <= 0 && b >= 0) return 0.25;
        double x = Math.Min(Math.Abs(a), Math.Abs(b));
        double s = Softplus.Sigmoid(x);
        return s * (1 - s);
    }

    /// <summary>d = f − e: bits of a magnitude in format Q·.f below the segment index. Must be ≥ 0.</summary>
    public int IndexShift(int inputFractionBits) => inputFractionBits - StepFractionBits;

    /// <summary>P = R · 2^f = N · 2^d: magnitudes ≥ P give G = 0.</summary>
    public Int128 Limit(int inputFractionBits) => (Int128)Segments << IndexShift(inputFractionBits);

    /// <summary>
    /// Range of (G_q(m)·2^−E − G(m·2^−f)) in nats over the integers m ∈ [<paramref name="mMin"/>,
    /// <paramref name="mMax"/>] (m ≥ 0, format Q·.f). Tail (m ≥ P, G_q = 0): −G at the region's ends (G is decreasing).
    /// Table: interpolation error [0, max h²/8·G''] + interpolated entry error [min e_k, max e_k] + rounding of the
    /// interpolation step, over the segments the range touches.
    /// </summary>
    public ErrorInterval GError(Int128 mMin, Int128 mMax, int inputFractionBits)
    {
        if (mMin > mMax) return ErrorInterval.Empty;
        ArgumentOutOfRangeException.ThrowIfNegative(mMin);
        int f = inputFractionBits, d = IndexShift(f);
        if (d < 0) throw new InvalidOperationException("input format coarser than the table step");
        Int128 p = Limit(f);
        double lsb = Math.ScaleB(1.0, -FractionBits);
        double X(Int128 m) => Math.ScaleB((double)m, -f);
        var result = ErrorInterval.Empty;
        if (mMax >= p)
        {
            Int128 lo = Int128.Max(mMin, p);
            result = new ErrorInterval(-G(X(lo)), -G(X(mMax)));
        }
        if (mMin < p)
        {
            Int128 hi = Int128.Min(mMax, p - 1);
            int kMin = (int)(mMin >> d), kMax = (int)(hi >> d);
            int last = d == 0 ? kMax : kMax + 1;  // with d = 0 every input is a node: no interpolation
            var (eLo, eHi) = EntryErrorRange(kMin, last);
            // G'' decreases on [0, ∞), so the first segment has the largest interpolation bound.
            double interp = d > 0 ? _interpBound[kMin] : 0;
            var table = new ErrorInterval(0, interp) + lsb * new ErrorInterval(eLo, eHi)
                        + lsb * FixedRounding.DropBitsError(d, nonNegative: true);
            result = result.Hull(table);
        }
        return result;
    }

    /// <summary>
    /// G_q(m) in plain integer arithmetic for a magnitude m ≥ 0 in format Q·.f (the generated code's lookup, see
    /// <see cref="FixedPointSimulator"/>): 0 when m ≥ P; else with k = m &gt;&gt; d, r = m &amp; (2^d − 1):
    /// T[k] when d = 0, otherwise T[k+1] + (((T[k] − T[k+1])·(2^d − r) + 2^(d−1)) &gt;&gt; d).
    /// </summary>
    public long LookupG(long m, int inputFractionBits)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(m);
        int d = IndexShift(inputFractionBits);
        if (m >= Limit(inputFractionBits)) return 0;
        int k = (int)(m >> d);
        if (d == 0) return Entries[k];
        long r = m & ((1L << d) - 1);
        return Entries[k + 1] + (((Entries[k] - Entries[k + 1]) * ((1L << d) - r) + (1L << (d - 1))) >> d);
    }

    /// <summary>softplus_q(a) = (a &gt; 0 ? to_energy(a, f − E) : 0) + G_q(|a|), plain integer arithmetic.</summary>
    public long LookupSoftplus(long a, int inputFractionBits)
    {
        long pos = a > 0 ? (long)FixedRounding.Rescale(a, inputFractionBits - FractionBits) : 0;
        return pos + LookupG(Math.Abs(a), inputFractionBits);
    }

    private sealed record SparseTables(double[][] Min, double[][] Max);

    private SparseTables? _sparse;  // built on first use; one reference, so concurrent readers see whole tables

    /// <summary>min and max of the entry errors e_k for k ∈ [a, b] (sparse tables, O(1) per query).</summary>
    private (double Lo, double Hi) EntryErrorRange(int a, int b)
    {
        var sparse = _sparse;
        if (sparse is null)
        {
            int n = _entryError.Length, levels = BitOperations.Log2((uint)n) + 1;
            var mins = new double[levels][];
            var maxs = new double[levels][];
            mins[0] = (double[])_entryError.Clone();
            maxs[0] = (double[])_entryError.Clone();
            for (int l = 1; l < levels; l++)
            {
                int span = 1 << l, count = n - span + 1;
                mins[l] = new double[count];
                maxs[l] = new double[count];
                for (int i = 0; i < count; i++)
                {
                    mins[l][i] = Math.Min(mins[l - 1][i], mins[l - 1][i + span / 2]);
                    maxs[l][i] = Math.Max(maxs[l - 1][i], maxs[l - 1][i + span / 2]);
                }
            }
            _sparse = sparse = new SparseTables(mins, maxs);
        }
        int lv = BitOperations.Log2((uint)(b - a + 1));
        int second = b - (1 << lv) + 1;
        return (Math.Min(sparse.Min[lv][a], sparse.Min[lv][second]),
            Math.Max(sparse.Max[lv][a], sparse.Max[lv][second]));
    }

    /// <summary>
    /// Range of (softplus_q(a)·2^−E − softplus(a·2^−f)) in nats over the integers a ∈ [<paramref name="aMin"/>,
    /// <paramref name="aMax"/>], softplus_q(a) = (a &gt; 0 ? to_energy(a, f − E) : 0) + G_q(|a|): the hull of the
    /// non-positive part (G error only) and the positive part (G error plus the rounding of to_energy).
    /// </summary>
    public ErrorInterval SoftplusError(Int128 aMin, Int128 aMax, int inputFractionBits)
    {
        var result = ErrorInterval.Empty;
        if (aMin <= 0)
        {
            Int128 hi = Int128.Min(aMax, 0);
            result = GError(-hi, -aMin, inputFractionBits);
        }
        if (aMax > 0)
        {
            Int128 lo = Int128.Max(aMin, 1);
            var pos = GError(lo, aMax, inputFractionBits)
                      + Math.ScaleB(1.0, -FractionBits) * FixedRounding.DropBitsError(inputFractionBits - FractionBits,
                          nonNegative: true);
            result = result.Hull(pos);
        }
        return result;
    }
}
