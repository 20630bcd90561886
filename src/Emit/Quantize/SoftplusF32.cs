namespace Emit.Quantize;

/// <summary>
/// The branch-free single-precision G(d) = log(1 + e^−d), d &gt;= 0, of the generated f32 C scorer (no libm call, and
/// compilers vectorize it). e^−d = 2^k·p(f), k = round(−d·log2 e), f = −d·log2 e − k ∈ [−½, ½], with p a degree-6
/// polynomial for 2^f (k added to p's exponent bits); then log(1 + e) = 2u·q(u²) with u = e/(2 + e) ∈ (0, ⅓], from
/// log((1 + u)/(1 − u)) = 2 atanh u, and q a degree-4 polynomial for atanh(√s)/√s on [0, 1/9]. Both are evaluated in
/// Estrin's scheme. d is clamped to <see cref="Clamp"/> on its bit pattern, so 2^k stays a normal number; G(32) &lt;
/// 1.3e-14. The coefficients are least-squares fits on Chebyshev nodes, reweighted towards equal ripple (relative
/// error 1.9e-9 for p, weighted absolute error 1.4e-9 for 2u·q in exact arithmetic), rounded to binary32; the float
/// roundings dominate the error. <see cref="MaxAbsError"/> is the largest |G_f32(d) − log1p(exp(−d))| (the reference
/// in double) over every non-negative float, found by the exhaustive run of <c>tools/softplus-check</c>
/// (docs/benchmarks.md, "f32 softplus"); the tests run the same program over the generated function.
/// </summary>
public static class SoftplusF32
{
    /// <summary>p(f) ≈ 2^f on [−½, ½], constant term first.</summary>
    public static IReadOnlyList<float> Exp2 { get; } =
        [1.0f, 0.693147182f, 0.240226462f, 0.0555032864f, 0.00961848907f, 0.00133999309f, 0.000153457950f];

    /// <summary>q(s) ≈ atanh(√s)/√s on [0, 1/9], constant term first.</summary>
    public static IReadOnlyList<float> Atanh { get; } = [1.0f, 0.333329350f, 0.200196698f, 0.138937950f, 0.144349903f];

    /// <summary>−log2 e rounded to binary32.</summary>
    public const float MinusLog2E = -1.44269502f;

    /// <summary>The largest d used (larger arguments are clamped to it): 32, binary32 bit pattern 0x42000000.</summary>
    public const float Clamp = 32.0f;

    /// <summary>The bit pattern of <see cref="Clamp"/>.</summary>
    public const uint ClampBits = 0x42000000u;

    /// <summary>
    /// Upper bound on |G_f32(d) − G(d)| over every non-negative binary32 d: the exhaustive maximum 2.37e-7 (at d ≈
    /// 0.0251, tools/softplus-check), rounded up, with the exact G's distance from its double-precision reference
    /// (below 1e-15) included.
    /// </summary>
    public const double MaxAbsError = 2.4e-7;
}
