using Emit.Emission;
using Emit.Quantize;

namespace Emit.Tests.Emission;

/// <summary>valgrind memcheck over the generated C of every case and numeric mode, on the test vectors.</summary>
public sealed class ValgrindTests
{
    [SkippableFact]
    public void Generated_c_runs_clean_under_memcheck_in_every_mode()
    {
        var valgrind = Toolchain.Require("valgrind");
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64, NumericMode.Fixed })
            {
                var dir = Toolchain.TempDir("memcheck-" + c.Id);
                var name = CodegenCases.Generate(c, mode, dir);
                var built = CHarness.Build(dir, name, c.Model.Threshold.HasValue, "-g", integer: mode == NumericMode.Fixed);
                var vectors = CodegenCases.Vectors(c).Take(12).ToList();
                var input = string.Concat(vectors.Select(v => Convert.ToHexStringLower(SelfTestVectors.Pack(v)) + "\n"));
                var (exit, output, err) = Toolchain.Run(valgrind,
                    ["--tool=memcheck", "--error-exitcode=99", "--leak-check=full", "--errors-for-leak-kinds=all", "-q", built.Exe], dir, input);
                Assert.True(exit == 0, $"{name}: exit {exit}\n{err}");
                Assert.True(output.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length == vectors.Count + 1, $"{name}: {output}");
            }
    }
}
