using System.Globalization;
using System.Runtime.CompilerServices;
using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;
using Xunit.Abstractions;

namespace Emit.Tests.Emission;

/// <summary>
/// The float modes' footprint on their reference core, judged by the Arm toolchain (Debian gcc-arm-none-eabi): the
/// generated f32 and f64 C compiles for a Cortex-M4F with hard float and the strict warnings, its object needs only
/// the libm functions the header names (plus memcpy/memset and, for f64 on this single-precision core, libgcc's
/// double routines), and the header's predicted flash and stack hold against <c>arm-none-eabi-size</c> and the
/// <c>-fstack-usage</c> frames along the <c>-fcallgraph-info=su</c> call graph: flash within 15 % + 256 bytes, the
/// generated code's own stack within the prediction less its stated library allowance (library frames are not in
/// the call graph's figures; the allowance is <see cref="CortexM4FFootprint.LibraryStackAllowance"/> bytes).
/// </summary>
public sealed class CortexM4FTests(ITestOutputHelper output)
{
    private const string M4FFlags = "-mcpu=cortex-m4 -mthumb -mfpu=fpv4-sp-d16 -mfloat-abi=hard -Os -Werror " + Toolchain.StrictC;

    private static string ReferenceModelPath([CallerFilePath] string here = "") =>
        Path.GetFullPath(Path.Combine(Path.GetDirectoryName(here)!, "..", "..", "..", "demo-data", "reefer-fleet.json"));

    [SkippableFact]
    public void Generated_float_c_for_cortex_m4f_needs_only_the_stated_libm_functions_and_fits_the_predicted_footprint()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        var nm = Toolchain.Require("arm-none-eabi-nm");
        var size = Toolchain.Require("arm-none-eabi-size");
        var dir = Toolchain.TempDir("m4f");
        var models = new List<(string Id, BoltzmannModel Model)> { ("reefer", ModelLoader.Load(ReferenceModelPath())) };
        models.AddRange(CodegenCases.All.Select(c => (c.Id, c.Model)));
        var table = new List<string> { "build | flash measured / predicted | own stack measured / predicted less allowance" };
        var failures = new List<string>();
        foreach (var (id, model) in models)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
            {
                var name = id + "_" + mode.ToText();
                var options = new CompileOptions(["c"], mode, name);
                foreach (var f in ScorerCompiler.Compile(model, name + ".json", options))
                    File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
                var predicted = FootprintModel.Predict(FloatScorerPlan.Build(model, options, name + ".json"));
                var obj = Path.Combine(dir, name + ".o");
                string[] extra = mode == NumericMode.F32 ? ["-Wdouble-promotion"] : [];
                Toolchain.RunOk(gcc, [.. Toolchain.Split(M4FFlags), .. extra, "-fstack-usage", "-fcallgraph-info=su", "-dumpdir", dir + "/",
                    "-I", dir, "-c", Path.Combine(dir, name + ".c"), "-o", obj]);
                var undefined = Toolchain.RunOk(nm, ["-u", obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.Trim().Split(' ')[^1]).ToArray();
                foreach (var symbol in undefined)
                {
                    bool ok = predicted.LibmFunctions.Contains(symbol) || symbol is "memcpy" or "memset"
                              || (mode == NumericMode.F64 && Regex.IsMatch(symbol, @"^__aeabi_d\w+$|^__aeabi_[fi]2d$|^__aeabi_d2[fi]z?$"));
                    if (!ok) failures.Add($"{name} needs {symbol}, which the header does not name");
                }
                foreach (var libm in predicted.LibmFunctions.Where(f => !f.StartsWith("fabs", StringComparison.Ordinal)))
                    if (!undefined.Contains(libm)) failures.Add($"{name}: the header names {libm}, which the object does not call");
                var columns = Toolchain.RunOk(size, [obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries)[1]
                    .Split((char[])[' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
                long flash = long.Parse(columns[0], CultureInfo.InvariantCulture) + long.Parse(columns[1], CultureInfo.InvariantCulture);
                var ci = File.ReadAllText(Path.Combine(dir, name + ".ci"));
                var library = Regex.Matches(ci, @"node: \{ title: ""([^""]+)"" label: ""([^""]*)""")
                    .Where(m => !m.Groups[2].Value.Contains("bytes (", StringComparison.Ordinal))
                    .ToDictionary(m => m.Groups[1].Value, _ => 0);
                int stack = CortexM0Tests.WorstStack(ci, name, library);
                int own = predicted.StackBytes - predicted.Figures.LibraryStackAllowance;
                table.Add($"{name} | {flash} / {predicted.FlashBytes} (code {flash - predicted.Figures.TableBytes} / {predicted.Figures.CodeBytes}) | {stack} / {own}");
                if (Math.Abs(flash - predicted.FlashBytes) > 0.15 * flash + 256) failures.Add($"{name}: flash {flash}, predicted {predicted.FlashBytes}");
                if (stack > own) failures.Add($"{name}: stack {stack} above the predicted {own} (without the library allowance)");
                if (own > 1.5 * stack + 64) failures.Add($"{name}: predicted stack {own} far above the measured {stack}");
            }
        foreach (var line in table) output.WriteLine(line);
        File.WriteAllLines(Path.Combine(dir, "footprint.txt"), table);
        Assert.True(failures.Count == 0, string.Join("\n", failures) + "\n" + string.Join("\n", table));
    }

    /// <summary>
    /// The extra flash of streamed scoring and explanations the header states for the float modes
    /// (<see cref="FeatureFootprint"/>) is within 15 % + 128 bytes of the difference arm-none-eabi-size measures
    /// between builds with and without each feature, on the demo model and the rbm and lateral codegen models.
    /// </summary>
    [SkippableFact]
    public void Float_stream_and_explain_flash_is_as_the_header_states()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        var size = Toolchain.Require("arm-none-eabi-size");
        var dir = Toolchain.TempDir("m4f-features");
        var models = new List<(string Id, BoltzmannModel Model)> { ("reefer", ModelLoader.Load(ReferenceModelPath())) };
        models.AddRange(CodegenCases.All.Where(c => c.Model.Kind != ModelKind.General && c.Model.Visible > 1)
            .Select(c => (c.Id, c.Model)));
        long Flash(string name, BoltzmannModel model, NumericMode mode, bool stream, bool explain)
        {
            var options = new CompileOptions(["c"], mode, name, Stream: stream, Explain: explain);
            foreach (var f in ScorerCompiler.Compile(model, name + ".json", options))
                File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
            var obj = Path.Combine(dir, name + ".o");
            Toolchain.RunOk(gcc, [.. Toolchain.Split(M4FFlags), "-I", dir, "-c", Path.Combine(dir, name + ".c"), "-o", obj]);
            var fields = Toolchain.RunOk(size, [obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries)[1]
                .Split((char[])[' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
            return long.Parse(fields[0], CultureInfo.InvariantCulture) + long.Parse(fields[1], CultureInfo.InvariantCulture);
        }
        foreach (var (id, model) in models)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
            {
                string n = id + "_" + mode.ToText();
                long plain = Flash(n + "p", model, mode, false, false), stream = Flash(n + "s", model, mode, true, false);
                long both = Flash(n + "e", model, mode, false, true);
                var plan = FloatScorerPlan.Build(model, new CompileOptions(["c"], mode, n, Explain: true), n + ".json");
                long ps = FeatureFootprint.StreamFlash(plan), pe = FeatureFootprint.ExplainFlash(plan);
                output.WriteLine($"{n} | stream {stream - plain} / {ps} | explain {both - stream} / {pe}");
                Assert.True(Math.Abs(stream - plain - ps) <= 0.15 * (stream - plain) + 128, $"{n}: stream {stream - plain}, predicted {ps}");
                Assert.True(Math.Abs(both - stream - pe) <= 0.15 * (both - stream) + 128, $"{n}: explain {both - stream}, predicted {pe}");
            }
    }

    /// <summary>
    /// The worst-case stack the header states for <c>NAME_explain</c> in the float modes
    /// (<see cref="FeatureFootprint.ExplainStack"/>), less the library allowance it includes, is an upper bound of
    /// the stack measured on Cortex-M4F (<c>-fstack-usage</c> frames along the <c>-fcallgraph-info=su</c> call graph
    /// from NAME_explain; library frames are not in these figures, hence the allowance) and not far above it, as for
    /// the scorer.
    /// </summary>
    [SkippableFact]
    public void Float_explain_stack_stated_in_the_header_bounds_the_measured_one()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        var dir = Toolchain.TempDir("m4f-explain-stack");
        var models = new List<(string Id, BoltzmannModel Model)> { ("reefer", ModelLoader.Load(ReferenceModelPath())) };
        models.AddRange(CodegenCases.All.Where(c => c.Model.Kind != ModelKind.General && c.Model.Visible > 1)
            .Select(c => (c.Id, c.Model)));
        var failures = new List<string>();
        output.WriteLine("build | explain stack measured / stated less allowance (allowance)");
        foreach (var (id, model) in models)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
            {
                string name = id + "_" + mode.ToText() + "x";
                var options = new CompileOptions(["c"], mode, name, Explain: true);
                foreach (var f in ScorerCompiler.Compile(model, name + ".json", options))
                    File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
                Toolchain.RunOk(gcc, [.. Toolchain.Split(M4FFlags), "-fstack-usage", "-fcallgraph-info=su",
                    "-dumpdir", dir + "/", "-I", dir, "-c", Path.Combine(dir, name + ".c"),
                    "-o", Path.Combine(dir, name + ".o")]);
                var ci = File.ReadAllText(Path.Combine(dir, name + ".ci"));
                var library = Regex.Matches(ci, @"node: \{ title: ""([^""]+)"" label: ""([^""]*)""")
                    .Where(m => !m.Groups[2].Value.Contains("bytes (", StringComparison.Ordinal))
                    .ToDictionary(m => m.Groups[1].Value, _ => 0);
                int measured = CortexM0Tests.WorstStack(ci, name, library, ["_explain"]);
                var plan = FloatScorerPlan.Build(model, options, name + ".json");
                var dialect = new Emit.Emission.Dialects.CDialect(plan);
                int allowance = FeatureFootprint.ExplainLibraryAllowance(plan);
                int stated = dialect.ExplainStackBytes, own = stated - allowance;
                Assert.Contains($"{stated}", File.ReadAllText(Path.Combine(dir, name + ".h")));
                output.WriteLine($"{name} | {measured} / {own} ({allowance})");
                if (measured > own) failures.Add($"{name}: explain stack {measured} above the stated {own}");
                if (own > 1.5 * measured + 64) failures.Add($"{name}: stated explain stack {own} far above {measured}");
            }
        Assert.True(failures.Count == 0, string.Join("\n", failures));
    }
}
