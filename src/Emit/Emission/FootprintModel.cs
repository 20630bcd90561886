using Emit.Quantize;
namespace Emit.Emission;

/// <summary>
/// The footprint of a planned scorer on its mode's reference core (<see cref="CortexM0Footprint"/> in fixed mode,
/// <see cref="CortexM4FFootprint"/> in float modes).
/// </summary>
public static class FootprintModel
{
    /// <summary>Reference core and compiler of fixed mode.</summary>
    public const string FixedReference = "Cortex-M0, arm-none-eabi-gcc -mcpu=cortex-m0 -mthumb -Os";

    /// <summary>Reference core and compiler of the float modes.</summary>
    public const string FloatReference = "Cortex-M4F, arm-none-eabi-gcc -mcpu=cortex-m4 -mthumb -mfpu=fpv4-sp-d16 " +
        "-mfloat-abi=hard -Os";

    /// <summary>The predicted footprint and dependencies of <paramref name="plan"/>'s C output.</summary>
    public static ScorerFootprint Predict(ScorerPlan plan) => plan switch
    {
        FixedScorerPlan f => new ScorerFootprint(FixedReference,
            CortexM0Footprint.Predict(f.Fixed, f.SelfTest.Count, f.Options.Optimize), []),
        FloatScorerPlan p => new ScorerFootprint(FloatReference, CortexM4FFootprint.Predict(p), LibmFunctions(p)),
        _ => throw new ArgumentException("unknown plan type", nameof(plan)),
    };

    /// <summary>
    /// The libm functions the float C calls: exp and log (float forms in f32) when there are hidden units, except in
    /// f32 without hidden-hidden links, whose softplus is a polynomial (<see cref="SoftplusF32"/>).
    /// </summary>
    public static IReadOnlyList<string> LibmFunctions(ScorerPlan plan)
    {
        if (plan.Mode == NumericMode.Fixed || !plan.HasHidden) return [];
        if (plan.Mode == NumericMode.F32 && !plan.IsGeneral) return [];
        string s = plan.Mode == NumericMode.F32 ? "f" : "";
        return plan.IsGeneral ? ["exp" + s, "log" + s] : ["exp" + s, "log" + s, "fabs" + s];
    }
}
