using System.Globalization;
using Emit.Emission;
using Emit.Model;

namespace Emit.Quantize;

/// <summary>
/// Refuses a floating-point scorer whose intermediates could overflow the mode's largest finite value (FLT_MAX for
/// f32, DBL_MAX for f64; C99 5.2.4.2.2), where the computed value would become ±∞ and the error bound would not
/// hold. Every quantity the generated code forms is checked with its worst-case rounding error added:
/// <list type="bullet">
/// <item>each hidden pre-activation and every partial sum of it: the exact range [c_j + Σ min(0, W_ij),
/// c_j + Σ max(0, W_ij)] of <see cref="RangeAnalysis"/> (a partial sum is the pre-activation of another
/// binary input, so it lies inside; the group sums r0 + r1 and (r0 + r1) + (r2 + r3) are at most Σ |W_ij| in
/// magnitude);</item>
/// <item>the linear part b·v + Σ L_ij v_i v_j and its partial sums: the enclosure [Σ negative, Σ positive];</item>
/// <item>the running energy −linear − Σ softplus(a_j) (softplus(x) ≤ max(x, 0) + ln 2) and, for kind general, the
/// Gray-code scores (at most Σ_j max|a_j| + Σ |M_kl|) and the log-sum-exp (at most that plus H ln 2).</item>
/// </list>
/// The magnitudes are formed in double precision; one that overflows double is infinite and refused.
/// </summary>
public static class FloatRangeCheck
{
    /// <summary>
    /// Throws <see cref="EmitException"/> unless every intermediate plus <paramref name="errorBound"/> stays finite in
    /// the mode.
    /// </summary>
    public static void Check(BoltzmannModel model, NumericMode mode, double errorBound)
    {
        double max = mode == NumericMode.F32 ? float.MaxValue : double.MaxValue;
        string type = mode == NumericMode.F32 ? "32-bit float (FLT_MAX 3.40282347e+38)"
            : "64-bit double (DBL_MAX 1.7976931348623157e+308)";
        string hint = mode == NumericMode.F32 ? "use --numeric f64"
            : "the model's parameters are too large for floating point; rescale the model";
        if (!double.IsFinite(errorBound))
            throw new EmitException($"the worst-case error bound of this model does not fit in a {type}", hint);

        var r = RangeAnalysis.Of(model);
        void Refuse(string what, double magnitude) => throw new EmitException(
            string.Create(CultureInfo.InvariantCulture, $"{what} reaches {magnitude:G6} in magnitude, ")
            + $"beyond the largest {type}; the scorer would overflow to infinity",
            hint);
        bool Fits(double magnitude) => magnitude + errorBound <= max;   // false for NaN and ∞ too

        double scores = 0, sp = 0;
        for (int j = 0; j < r.Hidden.Length; j++)
        {
            var a = r.Hidden[j];
            if (!Fits(a.MaxAbs))
                Refuse($"the pre-activation of hidden unit {j} (or one of its partial sums)", a.MaxAbs);
            scores += a.MaxAbs;
            sp += Math.Max(0, a.Max) + Math.Log(2);
        }
        var linear = r.VisibleBiasTerm + r.LateralTerm;
        if (!Fits(linear.MaxAbs))
            Refuse("the visible-bias and lateral part of the energy (or one of its partial sums)", linear.MaxAbs);
        double hiddenPart = sp;
        if (model.Kind == ModelKind.General)
        {
            scores += r.HiddenLinkTerm.Max - r.HiddenLinkTerm.Min;
            if (!Fits(2 * scores))
                Refuse("a hidden-state score of the general model (or its distance to the largest)", 2 * scores);
            hiddenPart = scores + model.Hidden * Math.Log(2);
        }
        double energy = linear.MaxAbs + hiddenPart;
        if (!Fits(energy)) Refuse("the free energy (or one of its partial sums)", energy);
    }
}
