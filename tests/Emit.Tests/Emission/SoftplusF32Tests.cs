using System.Globalization;
using System.Runtime.CompilerServices;
using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Quantize;
using Xunit.Abstractions;

namespace Emit.Tests.Emission;

/// <summary>
/// The f32 softplus polynomial of the generated C against the C library's log1p(exp(−d)) in double precision, by the
/// checking program in tools/softplus-check run over the function copied out of a generated scorer. Outside CI every
/// 61st float bit pattern (35 million values, a few seconds); in CI (CI=true, as .ci/run sets it) every non-negative
/// float, 2^31 values, which takes one to two minutes of the C library's double exp and log1p, too long for every
/// local run. The stated bound <see cref="SoftplusF32.MaxAbsError"/> must hold, and the exhaustive maximum
/// (docs/benchmarks.md) must not be far below it, or the bound would be loose by mistake.
/// </summary>
public sealed class SoftplusF32Tests(ITestOutputHelper output)
{
    private static string CheckerDir([CallerFilePath] string here = "") =>
        Path.GetFullPath(Path.Combine(Path.GetDirectoryName(here)!, "..", "..", "..", "tools", "softplus-check"));

    [SkippableFact]
    public void Generated_f32_softplus_is_within_its_stated_error_of_log1p_exp_in_double()
    {
        var cc = Toolchain.Require("cc");
        var dir = Toolchain.TempDir("softplus");
        var model = CodegenCases.All.First(c => c.Id == "rbm_a").Model;
        var c = ScorerCompiler.Compile(model, "sp.json", new CompileOptions(["c"], NumericMode.F32, "sp"))
            .Single(f => f.FileName == "sp.c").Text;
        var function = Regex.Match(c, @"^static float sp_softplus\(float x\)\n\{\n(.*?\n)\}\n",
            RegexOptions.Multiline | RegexOptions.Singleline);
        Assert.True(function.Success, "the generated f32 scorer has no sp_softplus(float)");
        Assert.DoesNotContain("expf", function.Value, StringComparison.Ordinal);
        File.WriteAllText(Path.Combine(dir, "softplus_under_test.c"),
            function.Value.Replace("sp_softplus", "softplus_under_test", StringComparison.Ordinal));
        var exe = Path.Combine(dir, "check");
        Toolchain.RunOk(cc,
            ["-std=c99", "-O2", "-Wall", "-Wextra", "-Werror", "-I", dir, Path.Combine(CheckerDir(), "check.c"),
             "-o", exe, "-lm"]);
        string stride = Toolchain.InCi ? "1" : "61";
        var parts = new[] { "0", "1" }.Select(p => Task.Run(() => Toolchain.RunOk(exe, [stride, p, "2"]))).ToArray();
        double worst = 0;
        foreach (var text in parts.Select(t => t.Result))
        {
            output.WriteLine(text.Trim());
            var m = Regex.Match(text, @"max abs error (\S+) at");
            Assert.True(m.Success, text);
            double e = double.Parse(m.Groups[1].Value, CultureInfo.InvariantCulture);
            Assert.False(double.IsNaN(e), text);
            worst = Math.Max(worst, e);
        }
        Assert.True(worst <= SoftplusF32.MaxAbsError,
            $"max abs error {worst:G4} above the stated {SoftplusF32.MaxAbsError:G4}");
        // tighter than 1.5e-7 would mean a much better polynomial than the one whose exhaustive maximum is stated
        Assert.True(worst > 1.5e-7,
            $"max abs error {worst:G4}: far below the stated {SoftplusF32.MaxAbsError:G4}; re-run the exhaustive "
            + "check");
    }
}
