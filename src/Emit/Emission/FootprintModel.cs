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
    public static ScorerFootprint Predict(ScorerPlan plan)
    {
        var footprint = plan switch
        {
            FixedScorerPlan f => new ScorerFootprint(FixedReference,
                CortexM0Footprint.Predict(f.Fixed, f.SelfTest.Count, f.Options.Optimize,
                    f.HasStream), []),
            FloatScorerPlan p => new ScorerFootprint(FloatReference, CortexM4FFootprint.Predict(p), LibmFunctions(p)),
            _ => throw new ArgumentException("unknown plan type", nameof(plan)),
        };
        if (Filter(plan) is { } filter)
            footprint = footprint with
            {
                Figures = footprint.Figures with
                {
                    FlashBytes = footprint.Figures.FlashBytes + filter.FlashBytes,
                    CodeBytes = footprint.Figures.CodeBytes + filter.FlashBytes,
                },
            };
        return footprint;
    }

    /// <summary>
    /// Code of NAME_filter_reset and NAME_filter_update (Cortex-M0 -Os in fixed mode, Cortex-M4F -Os in the float
    /// modes; the same C in every mode), measured with arm-none-eabi-size on Debian's arm-none-eabi-gcc 12.2 (46 bytes
    /// on Cortex-M0, 44 on Cortex-M4F, for 3/5) and rounded up to leave a margin (docs/generated-code.md, "Costs").
    /// </summary>
    public const int FilterCodeBytesM0 = 64, FilterCodeBytesM4F = 64;

    /// <summary>sizeof(NAME_filter_t) on a 32-bit core: a uint32_t and a uint8_t, padded to 4-byte alignment.</summary>
    public const int FilterRamBytes = 8;

    /// <summary>
    /// Code of NAME_classify: a call and a subtraction per model and the argmax loop, measured with arm-none-eabi-nm
    /// on Debian's arm-none-eabi-gcc 12.2 (docs/generated-code.md, "Classifier") and rounded up; the offsets table is
    /// one energy value per model. RAM: the caller's scores array, one energy value per model.
    /// </summary>
    public const int ClassifierCodeBase = 64, ClassifierCodePerModel = 16;

    /// <summary>The classifier's extra cost beside its models' scorers on the mode's reference core.</summary>
    public static FeatureCost Classifier(ClassifierPlan plan)
    {
        var each = ClassifierPerModel(plan.Models[0]);
        return new FeatureCost(ClassifierCodeBase + each.FlashBytes * plan.Count, each.RamBytes * plan.Count);
    }

    /// <summary>
    /// What each model adds to a classifier's own cost (<see cref="Classifier"/>) when its scorers are planned like
    /// <paramref name="plan"/>: a call, a subtraction and an offset (flash), and a score (the caller's RAM); the
    /// classifier adds <see cref="ClassifierCodeBase"/> bytes of flash once.
    /// </summary>
    public static FeatureCost ClassifierPerModel(ScorerPlan plan)
    {
        int energy = plan.Mode == NumericMode.F32 ? 4
            : plan is FixedScorerPlan f && f.Accumulator == AccumulatorType.Int32 ? 4 : 8;
        return new FeatureCost(ClassifierCodePerModel + energy, energy);
    }

    /// <summary>The alarm filter's extra cost on the mode's reference core, or null without a filter.</summary>
    public static FeatureCost? Filter(ScorerPlan plan) => plan.HasFilter ? FilterCost(plan.Mode) : null;

    /// <summary>
    /// The alarm filter's extra cost in <paramref name="mode"/> on the mode's reference core: the same for every K/N
    /// with N ≤ 32 (the window is one 32-bit word), and for every model (the filter sees decisions only).
    /// </summary>
    public static FeatureCost FilterCost(NumericMode mode) =>
        new(mode == NumericMode.Fixed ? FilterCodeBytesM0 : FilterCodeBytesM4F, FilterRamBytes);

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
