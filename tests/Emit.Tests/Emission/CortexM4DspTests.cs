using Emit.Emission;
using Emit.Harness;
using Emit.Quantize;

namespace Emit.Tests.Emission;

/// <summary>
/// The int8 packed-row scorer's DSP path (UXTAB16 through the ACLE intrinsic <c>__uxtab16</c>, chosen by
/// <c>__ARM_FEATURE_DSP</c>): cross-compiled for Cortex-M4 with the strict warnings, checked to contain the instruction,
/// and run on qemu's mps2-an386 (a Cortex-M4 board), where its self-test compares every result with the integers of
/// <see cref="FixedPointSimulator"/> (written into the file by the generator). The same image built with the DSP path
/// switched off must agree too. Skips when the Arm toolchain or qemu is absent; under CI=true their absence fails.
/// </summary>
public sealed class CortexM4DspTests
{
    private const string M4Flags = "-mcpu=cortex-m4 -mthumb -mfloat-abi=soft -O2 -Werror " + Toolchain.StrictC;

    /// <summary>int8 combinations with packed rows (speed, int32 accumulator, at least 16 hidden units).</summary>
    public static TheoryData<string> Int8Packed()
    {
        var data = new TheoryData<string>();
        foreach (var c in FixedCodegenCases.All)
            if (c.Weights == WeightType.Int8
                && Emit.Emission.Dialects.CDialect.UsesPackedRows(FixedCodegenCases.Plan(c), OptimizeFor.Speed))
                data.Add(c.Name);
        return data;
    }

    [SkippableTheory]
    [MemberData(nameof(Int8Packed))]
    public void Dsp_lanes_on_cortex_m4_give_the_simulators_integers(string combo)
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        var objdump = Toolchain.Require("arm-none-eabi-objdump");
        var qemu = Toolchain.Require("qemu-system-arm");
        var c = FixedCodegenCases.Find(combo);
        var dir = Toolchain.TempDir("m4dsp-" + combo);
        // 64 self-test vectors: the generator's exact expected integers come from FixedPointSimulator
        var files = ScorerCompiler.Build(c.Case.Model, c.Case.Id + ".json",
            FixedCodegenCases.Options(c, "c", selfTest: 64)).AllFiles;
        foreach (var f in files) File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var name = c.Name;
        var upper = name.ToUpperInvariant();
        File.WriteAllText(Path.Combine(dir, "startup.c"), HarnessTemplates.Startup("startup.c"));
        File.WriteAllText(Path.Combine(dir, "board.ld"), HarnessTemplates.LinkerScript("board.ld"));
        File.WriteAllText(Path.Combine(dir, "main.c"),
            $"#include <stdio.h>\n#include \"{name}.h\"\nint main(void)\n{{\n" +
            $"    printf(\"selftest failures %d of %d\\n\", {name}_selftest(), (int){upper}_SELFTEST_VECTORS);\n" +
            "    return 0;\n}\n");
        foreach (var dsp in new[] { 1, 0 })
        {
            var obj = Path.Combine(dir, $"{name}-{dsp}.o");
            Toolchain.RunOk(gcc, [.. Toolchain.Split(M4Flags), $"-D{upper}_DSP_LANES={dsp}", "-I", dir, "-c",
                Path.Combine(dir, name + ".c"), "-o", obj]);
            var code = Toolchain.RunOk(objdump, ["-d", obj]);
            Assert.Equal(dsp == 1, code.Contains("uxtab16", StringComparison.Ordinal));
            var elf = Path.Combine(dir, $"{name}-{dsp}.elf");
            Toolchain.RunOk(gcc, [.. Toolchain.Split(M4Flags), "--specs=rdimon.specs", "-T", Path.Combine(dir, "board.ld"),
                "-I", dir, Path.Combine(dir, "startup.c"), Path.Combine(dir, "main.c"), obj, "-o", elf]);
            var output = Toolchain.RunOk(qemu, ["-machine", "mps2-an386", "-cpu", "cortex-m4", "-nographic", "-monitor",
                "none", "-serial", "none", "-semihosting-config", "enable=on,target=native", "-kernel", elf]);
            Assert.Matches(@"selftest failures 0 of [1-9]\d*", output);
        }
    }
}
