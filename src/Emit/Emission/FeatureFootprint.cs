using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// The extra flash and RAM of streamed scoring and explanations on the mode's reference core
/// (<see cref="FootprintModel"/>): flash = code, a constant per mode and accumulator width measured with
/// arm-none-eabi-size on builds of Debian's arm-none-eabi-gcc 12.2 with and without the feature (the demo model and the
/// codegen test models; docs/generated-code.md), plus for lateral models the adjacency tables, whose sizes follow
/// from the link count. RAM: the caller's <c>NAME_stream_t</c> (<see cref="StreamRam"/>); stack of
/// <c>NAME_explain</c>: its frame (a <c>NAME_stream_t</c>, in fixed mode HIDDEN accumulators, saved registers) plus
/// the deepest callee and the library allowance, meant as an upper bound. The tests check flash within 15 % + 128 bytes
/// and the stack as an upper bound not far above the measured one, as for the scorer, on models with at least two
/// visible units (with one, the compiler folds the loops over units and the code is smaller than stated).
/// </summary>
public static class FeatureFootprint
{
    /// <summary>
    /// Bytes of <c>NAME_stream_t</c> under the usual C layout (members aligned to their size, as on the reference
    /// cores and x86-64): HIDDEN pre-activations and the linear sum in the energy type, the lateral sum (fixed mode
    /// with links), the flip count (float modes), the packed input, then padding to the energy type's alignment. The
    /// header states it as NAME_STREAM_BYTES; it is the same whether or not the plan emits the stream code.
    /// </summary>
    public static long StreamRam(ScorerPlan plan)
    {
        ArgumentNullException.ThrowIfNull(plan);
        long e = plan is FixedScorerPlan f ? f.AccumulatorBits / 8 : plan.Mode == NumericMode.F32 ? 4 : 8;
        long bytes = (plan.Hidden + 1) * e;
        if (plan is FixedScorerPlan && plan.HasLinks) bytes += e;
        if (plan is not FixedScorerPlan) bytes += 4;
        bytes += plan.PackedBytes;
        return (bytes + e - 1) / e * e;
    }

    /// <summary>Predicted extra flash of the stream code (bytes), 0 when it is not emitted.</summary>
    public static long StreamFlash(ScorerPlan plan)
    {
        if (!plan.HasStream) return 0;
        bool wide = Wide(plan);
        long code = plan is FixedScorerPlan ? (wide ? 300 : 240) : (wide ? 360 : 340);
        if (!plan.HasHidden) code = wide ? 150 : 115; // no row loops
        // packed weight rows (speed layout): each weight read unpacks its lane (measured on Cortex-M0: c12 +196)
        if (plan is FixedScorerPlan packed && Dialects.CDialect.UsesPackedRows(packed.Fixed, plan.Optimize))
            code += 200;
        if (plan.HasLinks)
        {
            long links = plan.LinkCount;
            code += 80;
            code += Table(plan.Visible + 1, 2 * links <= 0xFFFF ? 2 : 4)
                    + Table(2 * links, plan.Visible <= 0x10000 ? 2 : 4)
                    + Table(2 * links, links <= 0xFFFF ? 2 : 4);
        }
        return code;
    }

    /// <summary>Predicted extra flash of the explanation code beyond the stream code (bytes), 0 without it.</summary>
    public static long ExplainFlash(ScorerPlan plan)
    {
        if (!plan.HasExplain) return 0;
        bool wide = Wide(plan);
        long code = plan is FixedScorerPlan ? (wide ? 420 : 320) : (wide ? 360 : 300);
        if (!plan.HasHidden) code = wide ? 240 : 180;
        return plan.HasLinks ? code + 80 : code;
    }

    /// <summary>Predicted worst-case stack of <c>NAME_explain</c> (bytes), 0 when it is not emitted.</summary>
    public static int ExplainStack(ScorerPlan plan, long streamBytes)
    {
        if (!plan.HasExplain) return 0;
        bool wide = Wide(plan);
        long now = plan is FixedScorerPlan f ? (long)plan.Hidden * f.AccumulatorBits / 8 : 0;
        long frame = streamBytes + now + (wide ? 112 : 80);
        long callees = wide ? 96 : 64;
        return (int)(frame + callees + ExplainLibraryAllowance(plan));
    }

    /// <summary>
    /// The library allowance inside <see cref="ExplainStack"/>: the reference core's, as for the scorer (Cortex-M0
    /// for fixed point, Cortex-M4F for float, whose library calls include libm's in f64).
    /// </summary>
    public static int ExplainLibraryAllowance(ScorerPlan plan) => plan is FixedScorerPlan
        ? CortexM0Footprint.LibraryStackAllowance
        : CortexM4FFootprint.LibraryStackAllowance;

    private static bool Wide(ScorerPlan plan) =>
        plan is FixedScorerPlan f ? f.Accumulator == AccumulatorType.Int64 : plan.Mode == NumericMode.F64;

    private static long Table(long count, int size) => (count * size + 3) / 4 * 4;
}
