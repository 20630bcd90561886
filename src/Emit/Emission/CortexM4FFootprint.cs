using Emit.Quantize;
namespace Emit.Emission;

/// <summary>
/// Predicted flash and worst-case stack of the generated float C on a Cortex-M4F (gcc, <c>-mcpu=cortex-m4 -mthumb
/// -mfpu=fpv4-sp-d16 -mfloat-abi=hard -Os</c>). Flash = the tables, whose sizes follow exactly from the plan (each
/// rounded up to its alignment), plus the code, a constant per mode, model kind and lateral links measured on builds
/// with Debian's arm-none-eabi-gcc 12.2 (docs/generated-code.md lists them). f64 runs in software on this core's
/// single-precision unit, so its code calls libgcc's double routines (not counted in flash, like the libm functions).
/// Stack = the scorer's frames (the hidden accumulators, plus a measured constant for saved registers) plus the
/// caller's frame plus an allowance for the library functions called (libm and libgcc), whose frames the generated
/// code's own stack figures do not include. The stack figure is meant as an upper bound; the flash figure as an
/// estimate within 15 % + 256 bytes.
/// </summary>
public static class CortexM4FFootprint
{
    /// <summary>
    /// Stack allowed for the library functions the float scorer calls (expf/logf, or the soft-double routines).
    /// </summary>
    public const int LibraryStackAllowance = 96;

    /// <summary>
    /// Predicts the footprint of <c>emit compile --numeric f32|f64</c> C output for <paramref name="plan"/>.
    /// </summary>
    public static Footprint Predict(FloatScorerPlan plan)
    {
        bool f64 = plan.Mode == NumericMode.F64;
        int e = f64 ? 8 : 4;
        int v = plan.Visible, h = plan.Hidden, links = plan.LinkCount, packed = plan.PackedBytes,
            s = plan.SelfTest.Count;
        long tables = Table(v, e) + Table((long)s * packed, 1) + 2 * Table(s, e);
        if (plan.Optimize == OptimizeFor.Speed && v > 1) tables += Table(32, 1); // De Bruijn table, 32-bit words
        if (h > 0)
        {
            tables += Table(h, e) + Table((long)v * h, e);
            if (plan.IsGeneral) tables += Table((long)h * h, e);
        }
        if (links > 0)
        {
            int index = links <= 0xFFFF ? 2 : 4, other = v <= 0x10000 ? 2 : 4;
            tables += Table(v + 1, index) + Table(links, other) + Table(links, e);
        }
        int code = (h == 0, plan.IsGeneral, f64) switch
        {
            (true, _, false) => NoHiddenF32,
            (true, _, true) => NoHiddenF64,
            (false, false, false) => RbmF32,
            (false, false, true) => RbmF64,
            // the hidden-state walk: the compiler simplifies it for one or two hidden units
            (false, true, false) => Math.Min(GeneralF32, 450 + 120 * h),
            (false, true, true) => Math.Min(GeneralF64, 560 + 140 * h),
        };
        if (links > 0) code += f64 ? 100 : 80;
        // CDialect.FloatPass: eight waiting rows; with fewer than 8 visible units the compiler drops the pass of eight
        bool eightRows = h > 0 && plan.Optimize == OptimizeFor.Speed;
        if (eightRows && v >= 8) code += f64 ? EightRowCodeF64 : EightRowCodeF32;
        // the 16 partial sums of the softplus terms when optimizing for speed (CDialect.VectorBlock)
        int partial = !plan.IsGeneral && plan.Optimize == OptimizeFor.Speed && h >= 16 ? 16 * e : 0;
        int frame = (h == 0 ? 0 : h * e) + (plan.IsGeneral ? 2 * (h + 1) * e + 2 * plan.GrayBlockBits * e + 16 : 0)
                    + partial + (h == 0 && !f64 ? FrameNoHiddenF32 : f64 ? FrameF64 : FrameF32)
                    + (h > 0 && f64 ? RowGroupFrameF64 : 0)
                    + (eightRows ? (f64 ? EightRowFrameF64 : EightRowFrameF32) : 0);
        int caller = (packed + 7) / 8 * 8 + 16;
        return new Footprint(tables + code, tables, code, frame + caller + LibraryStackAllowance,
            LibraryStackAllowance);
    }

    // Code and frame bytes measured with Debian's arm-none-eabi-gcc 12.2 on the codegen cases of the tests and the demo
    // model (CortexM4FTests prints the table; docs/generated-code.md, "Costs in the float modes").
    private const int NoHiddenF32 = 230, NoHiddenF64 = 260, RbmF32 = 680, RbmF64 = 620, GeneralF32 = 930,
        GeneralF64 = 1100;
    private const int FrameF32 = 80, FrameF64 = 128, FrameNoHiddenF32 = 32;

    // The four waiting rows of the float row additions (acc += (r0 + r1) + (r2 + r3)) keep more soft-double values in
    // the f64 frame: up to 24 bytes over the figures above on the test models, rounded up.
    private const int RowGroupFrameF64 = 32;

    // Eight waiting rows a pass with --optimize speed (two groups of four in one pass, then a pass of four over the
    // last rows): more code, and more values in the frame, as measured on the demo model and the test models (reefer
    // f32: code 840 bytes, own stack 240; f64: 876 and 504), rounded up.
    private const int EightRowCodeF32 = 170, EightRowCodeF64 = 260, EightRowFrameF32 = 16, EightRowFrameF64 = 80;

    private static long Table(long count, int size)
    {
        int align = size == 8 ? 8 : 4;
        return (count * size + align - 1) / align * align;
    }
}
