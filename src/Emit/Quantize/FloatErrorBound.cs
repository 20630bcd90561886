using Emit.Model;
using Emit.Reference;

namespace Emit.Quantize;

/// <summary>
/// A bound on |F_computed(v) − F_exact(v)| for the generated floating-point scorers, by forward error analysis.
/// Sources: Higham, "Accuracy and Stability of Numerical Algorithms" (2nd ed., 2002): §2.2 model
/// fl(x op y) = (x op y)(1 + δ), |δ| &lt;= u; Lemma 3.1 and §4.2, recursive summation of n terms has error
/// &lt;= γ_(n−1) Σ|x_i| with γ_n = n·u/(1 − n·u); §4.2 pairwise summation of 2^k terms has error &lt;= γ_k Σ|x_i|.
/// The terms:
/// <list type="number">
/// <item>Each stored coefficient is the nearest value of the mode: relative error &lt;= u.</item>
/// <item>Pre-activation a_j = c_j + Σ_(i on) W_ij, summed in an order where each term meets at most k roundings (the
/// generated code adds rows four at a time, acc += (r0 + r1) + (r2 + r3), so a term meets at most k/4 + 2 ≤ k roundings
/// for k ≥ 3, and the last rows one at a time): (u + γ_k(1 + u))·(|c_j| + Σ_(i on) |W_ij|), k = active units.</item>
/// <item>softplus is 1-Lipschitz (its derivative is the logistic function), so an input error passes through at most
/// unchanged.</item>
/// <item>softplus(x) = max(x,0) + log(1 + exp(−|x|)) with exp and log each within <see cref="LibmUlps"/> ulps (relative
/// error A = LibmUlps·2u): with t = exp(−|x|) &lt;= 1, exp's error moves log(1 + t) by at most A·t, rounding 1 + t by
/// at most u (the argument lies in [1, 2]), log's own error is at most A·ln 2 (plus A·u), and the final addition
/// u·softplus(x). The allowance is ours (common practice); from memory, the glibc manual's table of known maximum
/// errors lists at most 1–2 ulps for expf/exp/logf/log on x86-64; .NET's Math/MathF call the platform C library.</item>
/// <item>f32: the generated C computes log(1 + exp(−|x|)) by the polynomial <see cref="SoftplusF32"/> instead of libm;
/// its error over every float argument, <see cref="SoftplusF32.MaxAbsError"/>, is added per hidden unit on top of the
/// libm terms (so one bound holds for the C and the C# scorer).</item>
/// <item>The final F = −linear − Σ_j softplus_j: either H subtractions in order, or (the generated C when optimizing
/// for speed) ⌈H/16⌉ terms into each of 16 partial sums, then 16 subtractions; every term meets at most
/// <see cref="SumRoundings"/> roundings: γ_n·(|linear| + Σ softplus_j).</item>
/// <item>general: log Σ_h exp(s(h)) is 1-Lipschitz in every s(h) (max norm) and its gradient in a sums to at most H,
/// so pre-activation errors add; the running Gray-code scores carry at most <see cref="GrayScoreRoundings"/> roundings
/// of quantities bounded by S = Σ|a_j| + Σ|M_kl|; exp(s − max) is within A relative, the pairwise sum of 2^H terms
/// within γ_H, log within A, and the final additions within u each.</item>
/// </list>
/// First-order terms are summed; the second-order remainder is covered by the factor (1 + 2γ_n) for the largest n used.
/// </summary>
public static class FloatErrorBound
{
    /// <summary>Allowance for exp and log of the C library or .NET, in units in the last place.</summary>
    public const double LibmUlps = 8;

    /// <summary>
    /// Log2 of the Gray-code block the generated general-model code recomputes scores at (see templates).
    /// </summary>
    public static int GrayBlockBits(int hidden) => Math.Min(hidden, 4);

    /// <summary>
    /// Roundings any one term of the final sum over H softplus terms meets, in either order the generated code uses:
    /// H in order, or ⌈H/16⌉ − 1 in a partial sum and 16 when the partial sums are subtracted.
    /// </summary>
    public static long SumRoundings(int hidden) => hidden < 16 ? hidden : Math.Max(hidden, (hidden + 15) / 16 + 16);

    /// <summary>Unit roundoff u of a float mode: 2^−24 for f32, 2^−53 for f64.</summary>
    public static double UnitRoundoff(NumericMode mode) => mode switch
    {
        NumericMode.F32 => Math.ScaleB(1.0, -24),
        NumericMode.F64 => Math.ScaleB(1.0, -53),
        _ => throw new ArgumentOutOfRangeException(nameof(mode), "float modes only"),
    };

    /// <summary>γ_n = n·u/(1 − n·u) (Higham §3.1); infinite when n·u &gt;= 1.</summary>
    public static double Gamma(long n, double u) => n * u >= 1 ? double.PositiveInfinity : n * u / (1 - n * u);

    /// <summary>
    /// Roundings in the derivation of one Gray-code score in the generated general-model code, for H hidden units and
    /// blocks of 2^B states: a fresh score (H + H(H−1)/2 additions), fresh fields (H − 1 each), then per step one
    /// addition of a field that has itself been updated at most once per earlier step.
    /// </summary>
    public static long GrayScoreRoundings(int hidden, int blockBits)
    {
        long h = hidden, t = (1L << blockBits) - 1;
        return h + h * (h - 1) / 2 + t * h + t * (t - 1) / 2;
    }

    /// <summary>The bound for one input (one byte per unit, nonzero = on).</summary>
    public static double ForVector(BoltzmannModel model, NumericMode mode, ReadOnlySpan<byte> units) =>
        Compute(model, UnitRoundoff(mode), units.ToArray(), GrayBlockBits(model.Hidden), pairwise: true,
            Polynomial(mode));

    /// <summary>The bound over every input: the largest term sums, all units on.</summary>
    public static double Worst(BoltzmannModel model, NumericMode mode) =>
        Compute(model, UnitRoundoff(mode), null, GrayBlockBits(model.Hidden), pairwise: true, Polynomial(mode));

    private static double Polynomial(NumericMode mode) => mode == NumericMode.F32 ? SoftplusF32.MaxAbsError : 0;

    /// <summary>
    /// The bound over every input for streamed scoring (docs/generated-code.md): the state is accumulated from the
    /// input one row at a time, then updated by at most <paramref name="flips"/> flips (each adds or subtracts one
    /// weight row and one visible field b_i + Σ_k L_ik v_k) before it is accumulated afresh. Each addition's rounding
    /// is bounded through the partial sum it produces rather than the terms (Higham §4.2, the bound by partial sums):
    /// after every toggle a pre-activation is exactly that of some binary input, so within Σ_i |W_ij| + |c_j|, and
    /// the linear sum is a subset sum of the b_i and L_ik; a pre-activation's error after V + flips additions is then
    /// within (u + γ_(V + flips))·(|c_j| + Σ_i |W_ij|), and the linear sum's as <see cref="Compute"/> states. The read
    /// is the scorer's own softplus sum, so the rest of the derivation is <see cref="Worst"/>'s.
    /// </summary>
    public static double StreamWorst(BoltzmannModel model, NumericMode mode, long flips)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(flips);
        return Compute(model, UnitRoundoff(mode), null, GrayBlockBits(model.Hidden), pairwise: true,
            Polynomial(mode), flips);
    }

    /// <summary>
    /// A bound on the error of <see cref="ReferenceScorer"/> itself (double precision; general models summed in
    /// blocks of 2^14 states with running rescaling), so a tolerance can allow for the expected value's own error.
    /// </summary>
    public static double Reference(BoltzmannModel model, ReadOnlySpan<byte> units) =>
        Compute(model, UnitRoundoff(NumericMode.F64), units.ToArray(), Math.Min(model.Hidden, 14), pairwise: false, 0);

    /// <summary>
    /// A bound on the error of <see cref="ReferenceScorer"/> over every input (as <see cref="Reference"/>, with the
    /// largest term sums).
    /// </summary>
    public static double ReferenceWorst(BoltzmannModel model) =>
        Compute(model, UnitRoundoff(NumericMode.F64), null, Math.Min(model.Hidden, 14), pairwise: false, 0);

    private static double Compute(BoltzmannModel m, double u, byte[]? units, int blockBits, bool pairwise,
        double polynomial, long flips = 0)
    {
        int v = m.Visible, h = m.Hidden;
        double a = LibmUlps * 2 * u;
        bool On(int i) => units is null || units[i] != 0;
        int k = 0;
        for (int i = 0; i < v; i++) if (On(i)) k++;

        // linear part: b_i over active units, then L_ij over active pairs
        double linAbs = 0, lin = 0;
        long linTerms = 0;
        for (int i = 0; i < v; i++)
            if (On(i)) { linAbs += Math.Abs(m.VisibleBias[i]); lin += m.VisibleBias[i]; linTerms++; }
        foreach (var l in m.VisibleLinks)
            if (On(l.I) && On(l.J)) { linAbs += Math.Abs(l.W); lin += l.W; linTerms++; }
        double linErr;
        if (flips > 0)
        {
            // Streamed scoring: the linear sum is built by toggles, each adding or subtracting a field
            // b_i + Σ_k L_ik v_k (at most 1 + degree terms, its own error within γ_degree·|b_i| + Σ_k |L_ik|); k on
            // units from all off, then the flips. After every toggle the exact value is the linear part of a binary
            // input, a subset sum of the coefficients, so each toggle's rounding is at most u·(linAbs + the error so
            // far), and the error after T toggles is within γ_T·linAbs + (γ_T/u)(1 + u)·γ_degree·(largest field)
            // (Higham, Lemma 3.1 on (1 + u)^T − 1).
            var degree = new int[v];
            var field = new double[v];
            for (int i = 0; i < v; i++) field[i] = Math.Abs(m.VisibleBias[i]);
            foreach (var l in m.VisibleLinks)
            {
                degree[l.I]++;
                degree[l.J]++;
                field[l.I] += Math.Abs(l.W);
                field[l.J] += Math.Abs(l.W);
            }
            int degreeMax = v > 0 ? degree.Max() : 0;
            long toggles = k + flips;
            double gt = Gamma(toggles, u);
            linErr = (u + gt * (1 + u)) * linAbs
                     + (gt / u) * (1 + u) * Gamma(degreeMax, u) * (v > 0 ? field.Max() : 0);
            linTerms = Math.Max(linTerms, toggles * (1 + degreeMax));
            k += (int)Math.Min(int.MaxValue - k, flips);
        }
        else linErr = (u + Gamma(linTerms, u) * (1 + u)) * linAbs;
        double linMag = units is null ? linAbs : Math.Abs(lin);
        long nMax = Math.Max(linTerms, k);

        // pre-activations
        var aErr = new double[h];
        var aMag = new double[h];   // bound on |a_j|
        var aMax = new double[h];   // bound on a_j from above
        double gk = Gamma(k, u);
        for (int j = 0; j < h; j++)
        {
            double abs = Math.Abs(m.HiddenBias[j]), sum = m.HiddenBias[j], top = m.HiddenBias[j];
            for (int i = 0; i < v; i++)
            {
                if (!On(i)) continue;
                double w = m.Weight(i, j);
                abs += Math.Abs(w);
                sum += w;
                top += Math.Max(0, w);
            }
            // Streamed scoring (flips > 0): after every row added or subtracted the exact value is the pre-activation
            // of a binary input, within [c_j + Σ min(0, W_ij), c_j + Σ max(0, W_ij)], so each rounding is at most
            // u·(abs + the error so far) and the error after the k + flips additions is within γ_(k + flips)·abs
            // (Higham, Lemma 3.1); abs and top need no term for the flips.
            aErr[j] = (u + gk * (1 + u)) * abs;
            aMag[j] = units is null ? abs : Math.Abs(sum);
            aMax[j] = units is null ? top : sum;
        }

        double total;
        if (m.Kind != ModelKind.General)
        {
            double spSum = 0, spErr = 0;
            for (int j = 0; j < h; j++)
            {
                double sp = Softplus.Of(aMax[j] + aErr[j]);
                double t = units is null ? 1.0 : Math.Exp(-Math.Max(0, Math.Abs(aMax[j]) - aErr[j]));
                spErr += aErr[j] + a * t + u + a * (Math.Log(2) + u) + u * sp + polynomial;
                spSum += sp;
            }
            long sum = SumRoundings(h);
            total = linErr + spErr + Gamma(sum, u) * (linMag + linErr + spSum + spErr);
            nMax = Math.Max(nMax, sum);
        }
        else if (h == 0)
        {
            total = linErr;
        }
        else
        {
            double mAbs = 0;
            foreach (var l in m.HiddenLinks) mAbs += Math.Abs(l.W);
            double s = mAbs * (1 + u);
            double aErrSum = 0;
            for (int j = 0; j < h; j++) { s += aMag[j] + aErr[j]; aErrSum += aErr[j]; }
            long roundings = GrayScoreRoundings(h, blockBits);
            double scoreErr = roundings * u * s;
            // relative error of the sum of exp(s - max): exp within A, the subtraction within u·|s − max| <= 2u·S
            // (taken as a score error below), the summation within γ_H (pairwise) or, summed in order with a
            // rescale per term, 2^H·(A + 2u).
            double rho = pairwise ? a + Gamma(h, u) : a + Gamma(1L << h, u) + (1L << h) * (a + 2 * u);
            double logSumErr = rho / (1 - rho);
            double lseMag = s + h * Math.Log(2);
            total = linErr + aErrSum + u * mAbs + scoreErr + 2 * u * s + logSumErr
                    + a * (h * Math.Log(2) + logSumErr) + u * lseMag + u * (linMag + linErr + lseMag + scoreErr);
            nMax = Math.Max(nMax, roundings);
        }
        return total * (1 + 2 * Gamma(nMax, u));
    }
}
