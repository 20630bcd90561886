using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// Predicted flash and worst-case stack of the generated fixed-point C on a Cortex-M0 (gcc, <c>-mcpu=cortex-m0 -mthumb
/// -Os</c>), for <c>emit inspect</c>. Flash = the tables, whose sizes follow exactly from the plan (each rounded up to
/// its alignment), plus the code, a constant per model kind, accumulator width and row-adding scheme measured on
/// builds with Debian's arm-none-eabi-gcc 12.2 (docs/generated-code.md lists them). Stack = the scorer's frame
/// (its arrays of accumulators, plus a constant for saved registers and spills, measured the same way and rounded
/// up), plus the caller's frame (<c>NAME_free_energy_units</c> packs the input on the stack), plus an allowance for
/// the C library and libgcc helpers the compiler may call (<c>memcpy</c>, <c>memset</c>, 64-bit shifts and
/// multiplication), whose frames the generated code's own stack figures do not include. The stack figure is meant
/// as an upper bound; the flash figure as an estimate within 15 % + 256 bytes. Helpers linked from the libraries
/// (a few hundred bytes with an int64 accumulator) are not in the flash figure.
/// </summary>
public static class CortexM0Footprint
{
    /// <summary>
    /// Stack allowed for library helpers (the deepest of them pushes five registers, 20 bytes, and may call one more
    /// that pushes two).
    /// </summary>
    public const int LibraryStackAllowance = 32;

    /// <summary>
    /// Predicts the footprint of <c>emit compile --numeric fixed</c> output with <paramref name="selfTestVectors"/>
    /// embedded inputs; <paramref name="stream"/>: the source also holds the stream functions, whose loops read the
    /// per-unit fraction bits from a table.
    /// </summary>
    public static Footprint Predict(FixedPointPlan plan, int selfTestVectors = CompileOptions.DefaultSelfTestVectors,
        OptimizeFor optimize = OptimizeFor.Speed, bool stream = false)
    {
        var m = plan.Model;
        int v = m.Visible, h = m.Hidden, links = m.VisibleLinks.Length, packed = (v + 7) / 8;
        bool wide = plan.Accumulator == AccumulatorType.Int64;
        int a = wide ? 8 : 4, w = plan.WeightType.Bits() / 8;
        bool general = m.Kind == ModelKind.General;
        bool uniform = h > 0 && plan.Units.All(u => u.FractionBits == plan.Units[0].FractionBits);
        int tableEntry = plan.Table.EntryFormat.TotalBits / 8;
        bool unrolled = Dialects.CDialect.UnrollsSoftplus(h, general, optimize);

        long tables = Table(v, a) + Table(selfTestVectors * packed, 1) + Table(selfTestVectors, a);
        if (optimize == OptimizeFor.Speed && v > 1) tables += Table(32, 1); // the word scan's De Bruijn table
        if (h > 0)
        {
            tables += Table(h, a) + Table(v * h, w) + Table(plan.Table.Segments + 1, tableEntry);
            // the per-unit fraction bits: literals of the unrolled softplus calls, a table where a loop reads them
            if (Dialects.CDialect.KeepsFractionBitsTable(uniform, h, general, optimize, stream)) tables += Table(h, 1);
            if (general) tables += Table(h * h, a);
        }
        if (links > 0)
        {
            int index = links <= 0xFFFF ? 2 : 4, other = v <= 0x10000 ? 2 : 4;
            tables += Table(v + 1, index) + Table(links, other) + Table(links, w);
        }

        bool pairs = optimize == OptimizeFor.Speed && plan.WeightType.Bits() < plan.Accumulator.Bits();
        int code = (h == 0, general, wide) switch
        {
            (true, _, false) => 200,
            (true, _, true) => 220,
            // the hidden-state walk: the compiler simplifies it for one or two hidden units
            (false, true, false) => Math.Min(770, 300 + 120 * h),
            (false, true, true) => Math.Min(1150, 420 + 180 * h),
            (false, false, false) => pairs ? 510 : 360,
            (false, false, true) => 860,
        };
        if (links > 0) code += wide ? 100 : 80;
        if (unrolled) code += UnrolledCodePerUnit * h;

        int frame = h == 0 ? (links > 0 ? (wide ? 96 : 56) : 24)
            : (general ? h * a + h * a + (h + 1) * a : h * a) + (wide ? (pairs ? 192 : 144) : 64) + (pairs ? 16 : 0);
        if (Dialects.CDialect.UsesPackedRows(plan, optimize))
        {
            // packed rows: two arrays of lane sums, the accumulators padded to whole words, a helper's frame; int16
            // rows of an RBM or lateral model feed the lane sums straight into softplus (CDialect.FusedSoftplus), with
            // no accumulator array at all
            int lanes = plan.WeightType == WeightType.Int8 ? 4 : 2, words = (h + lanes - 1) / lanes;
            bool fused = Dialects.CDialect.FusesSoftplus(plan.WeightType, general);
            frame += 2 * words * 4 + (fused ? -h * a : (lanes * words - h) * a) + PackedFrame;
            code += lanes == 4 ? PackedCodeInt8 : PackedCodeInt16;
        }
        // the unrolled softplus calls of a 64-bit accumulator keep more values in the frame (measured as above)
        if (unrolled && wide) frame += UnrolledWideFramePerUnit * h;
        int caller = Math.Max((packed + 7) / 8 * 8 + 32, 24);
        return new Footprint(tables + code, tables, code, frame + caller + LibraryStackAllowance,
            LibraryStackAllowance);
    }

    /// <summary>
    /// Code of each unit's own softplus call when it is unrolled (<see cref="Dialects.CDialect.UnrolledSoftplus"/>),
    /// measured with arm-none-eabi-size on the demo model 56 × 16 at -Os (11 bytes a unit with int16 weights, 6 with
    /// int8) and rounded up.
    /// </summary>
    public const int UnrolledCodePerUnit = 12;

    /// <summary>
    /// Extra frame a unit of an unrolled softplus sum with a 64-bit accumulator (4 bytes over the previous figure on
    /// a 24 × 19 model with int8 weights), rounded up.
    /// </summary>
    public const int UnrolledWideFramePerUnit = 2;

    // Packed rows (CDialect.PackedRows): extra code and frame bytes, measured as the constants above (the frame with
    // eight waiting rows a pass and the rest passes of four and two: 4 400 bytes of flash and 252 of stack measured
    // on the demo model with int16 weights, 3 476 and 284 with int8).
    private const int PackedCodeInt16 = 470, PackedCodeInt8 = 440, PackedFrame = 40;

    /// <summary>
    /// Bytes of a table of <paramref name="count"/> elements of <paramref name="size"/> bytes, rounded up to a word (8
    /// bytes for 64-bit elements).
    /// </summary>
    private static long Table(long count, int size)
    {
        int align = size == 8 ? 8 : 4;
        return (count * size + align - 1) / align * align;
    }
}
