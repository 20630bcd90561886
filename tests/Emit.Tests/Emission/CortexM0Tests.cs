using System.Globalization;
using System.Runtime.CompilerServices;
using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;
using Xunit.Abstractions;

namespace Emit.Tests.Emission;

/// <summary>
/// Proof that the fixed-point C is integer-only on a core without FPU or divider, judged by the Arm
/// toolchain (Debian gcc-arm-none-eabi): the generated C compiles for Cortex-M0 with float and double poisoned, and the
/// object file needs no floating-point, division or libm symbol from any library. The same builds measure flash
/// (<c>arm-none-eabi-size</c>) and worst-case stack (<c>-fstack-usage</c> frames along the <c>-fcallgraph-info=su</c>
/// call graph, plus the frames of the library helpers it calls, read from their disassembly), which
/// <c>emit inspect --numeric fixed</c> predicts (<see cref="CortexM0Footprint"/>).
/// </summary>
public sealed partial class CortexM0Tests(ITestOutputHelper output)
{
    /// <summary>Flags for a core without FPU plus the strict warnings of every C build in the tests.</summary>
    private const string M0Flags = "-mcpu=cortex-m0 -mthumb -mfloat-abi=soft -Os -Werror " + Toolchain.StrictC + " -Wdouble-promotion -Wfloat-conversion";

    /// <summary>The only library symbols the generated code may need: memory copy and fill, 64-bit shifts and multiplication (libgcc).</summary>
    private static readonly Regex Allowed = AllowedPattern();

    /// <summary>Floating-point helpers (soft-float ABI and libgcc names), integer division helpers and libm functions.</summary>
    private static readonly Regex Forbidden = ForbiddenPattern();

    [GeneratedRegex(@"^(memcpy|memset|memmove|__aeabi_mem(cpy|set|clr|move)\d?|__aeabi_lmul|__aeabi_llsl|__aeabi_llsr|__aeabi_lasr)$")]
    private static partial Regex AllowedPattern();

    [GeneratedRegex(@"^(__aeabi_[fd]\w*|__aeabi_\w+2[fd]|__aeabi_u?i?l?div\w*|__aeabi_u?ldivmod|__\w*[sdt]f\d?|__u?(div|mod)[sd]i3|" +
                    @"(exp|log|log1p|pow|sqrt|fabs|floor|ceil|round|ldexp|frexp)[fl]?)$")]
    private static partial Regex ForbiddenPattern();

    /// <summary>
    /// Writes poison.h into <paramref name="dir"/>: included first (<c>-include</c>), it makes any use of float or
    /// double a compile error (gcc's <c>#pragma GCC poison</c>); returns its path.
    /// </summary>
    private static string PoisonHeader(string dir)
    {
        var poison = Path.Combine(dir, "poison.h");
        File.WriteAllText(poison, "#pragma GCC poison float double\n");
        return poison;
    }

    private sealed record Build(string Name, long Flash, int Stack, string[] Undefined, Footprint Predicted);

    private static string ReferenceModelPath([CallerFilePath] string here = "") =>
        Path.GetFullPath(Path.Combine(Path.GetDirectoryName(here)!, "..", "..", "..", "demo-data", "reefer-fleet.json"));

    private static Build Compile(string dir, string name, BoltzmannModel model, FixedPointOptions options, string gcc, string poison,
        OptimizeFor optimize = OptimizeFor.Speed, bool stream = false, bool explain = false)
    {
        var plan = FixedPointPlanner.Build(model, options);
        var compileOptions = new CompileOptions(["c"], NumericMode.Fixed, name, Fixed: options, Optimize: optimize,
            Stream: stream, Explain: explain);
        foreach (var f in ScorerCompiler.Compile(model, name + ".json", compileOptions))
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var obj = Path.Combine(dir, name + ".o");
        Toolchain.RunOk(gcc, [.. Toolchain.Split(M0Flags), "-include", poison, "-fstack-usage", "-fcallgraph-info=su", "-dumpdir", dir + "/",
            "-I", dir, "-c", Path.Combine(dir, name + ".c"), "-o", obj]);
        var nm = Toolchain.RunOk(Toolchain.Require("arm-none-eabi-nm"), ["-u", obj]);
        var undefined = nm.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.Trim().Split(' ')[^1]).ToArray();
        var size = Toolchain.RunOk(Toolchain.Require("arm-none-eabi-size"), [obj]).Split('\n', StringSplitOptions.RemoveEmptyEntries)[1]
            .Split((char[])[' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
        long flash = long.Parse(size[0], CultureInfo.InvariantCulture) + long.Parse(size[1], CultureInfo.InvariantCulture);
        foreach (var line in File.ReadAllLines(Path.Combine(dir, name + ".su")))
            Assert.EndsWith("\tstatic", line);   // no variable-length arrays or alloca
        int stack = WorstStack(File.ReadAllText(Path.Combine(dir, name + ".ci")), name, HelperStack(gcc));
        return new Build(name, flash, stack, undefined, CortexM0Footprint.Predict(plan, compileOptions.SelfTestVectors, optimize));
    }

    /// <summary>
    /// The deepest stack over the call graph (VCG text of -fcallgraph-info=su) from the public functions: each node's
    /// frame from its "N bytes (static)" label, a library node's from <paramref name="helpers"/>.
    /// </summary>
    internal static int WorstStack(string ci, string name, IReadOnlyDictionary<string, int> helpers,
        string[]? entries = null)
    {
        var frames = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (Match m in Regex.Matches(ci, @"node: \{ title: ""([^""]+)"" label: ""([^""]*)"""))
        {
            var bytes = Regex.Match(m.Groups[2].Value, @"\\n(\d+) bytes \((static|dynamic[^)]*)\)");
            frames[m.Groups[1].Value] = bytes.Success ? int.Parse(bytes.Groups[1].Value, CultureInfo.InvariantCulture)
                : helpers.TryGetValue(m.Groups[1].Value, out int h) ? h
                : throw new InvalidOperationException($"no stack figure for {m.Groups[1].Value}");
        }
        var edges = Regex.Matches(ci, @"edge: \{ sourcename: ""([^""]+)"" targetname: ""([^""]+)""")
            .GroupBy(m => m.Groups[1].Value).ToDictionary(g => g.Key, g => g.Select(m => m.Groups[2].Value).Distinct().ToArray());
        int Depth(string fn, int guard)
        {
            Assert.True(guard < 64, "call graph too deep or recursive");
            int own = frames.TryGetValue(fn, out int f) ? f : helpers.TryGetValue(fn, out int h) ? h : throw new InvalidOperationException($"no stack figure for {fn}");
            return own + (edges.TryGetValue(fn, out var callees) ? callees.Max(c => Depth(c, guard + 1)) : 0);
        }
        return (entries ?? ["_free_energy", "_free_energy_units", "_selftest", "_is_unusual"])
            .Where(s => frames.ContainsKey(name + s)).Max(s => Depth(name + s, 0));
    }

    private static Dictionary<string, int>? _helpers;

    /// <summary>
    /// Frames of the library helpers the generated code may call, from the disassembly of the Cortex-M0 multilib of
    /// libgcc and newlib: every push (4 bytes per register) and every "sub sp" in the function's body, summed.
    /// </summary>
    private static Dictionary<string, int> HelperStack(string gcc)
    {
        if (_helpers is not null) return _helpers;
        var objdump = Toolchain.Require("arm-none-eabi-objdump");
        var result = new Dictionary<string, int>(StringComparer.Ordinal);
        foreach (var lib in new[] { "-print-libgcc-file-name", "-print-file-name=libc.a" })
        {
            var path = Toolchain.RunOk(gcc, ["-mcpu=cortex-m0", "-mthumb", "-mfloat-abi=soft", lib]).Trim();
            if (!File.Exists(path))
            {
                Assert.False(Toolchain.InCi, $"{path} is required under CI=true (.ci/run installs libnewlib-arm-none-eabi)");
                Skip.If(true, $"{path} is not installed (Debian libnewlib-arm-none-eabi)");
            }
            var text = Toolchain.RunOk(objdump, ["-d", path]);
            foreach (var block in text.Split("\n\n"))
            {
                var head = Regex.Match(block, @"^[0-9a-f]+ <([\w.]+)>:", RegexOptions.Multiline);
                if (!head.Success || !Allowed.IsMatch(head.Groups[1].Value)) continue;
                int bytes = 0;
                foreach (Match p in Regex.Matches(block, @"\tpush\s+\{([^}]*)\}")) bytes += 4 * p.Groups[1].Value.Split(',').Length;
                foreach (Match s in Regex.Matches(block, @"\tsub\s+sp, #(\d+)")) bytes += int.Parse(s.Groups[1].Value, CultureInfo.InvariantCulture);
                result[head.Groups[1].Value] = Math.Max(result.GetValueOrDefault(head.Groups[1].Value), bytes);
            }
        }
        return _helpers = result;
    }

    [SkippableFact]
    public void Generated_fixed_c_for_cortex_m0_uses_no_floating_point_division_or_libm_and_inspect_predicts_its_footprint()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        Toolchain.Require("arm-none-eabi-nm");
        var dir = Toolchain.TempDir("m0");
        var poison = PoisonHeader(dir);

        var builds = new List<Build>();
        var demo = ModelLoader.Load(ReferenceModelPath());
        foreach (var w in FixedCodegenCases.Weights)
            foreach (var acc in new AccumulatorType?[] { null, AccumulatorType.Int64 })
                builds.Add(Compile(dir, $"reefer_{w.ToText()}_{(acc is { } a ? a.ToText() : "auto")}", demo, new FixedPointOptions(w, acc), gcc, poison));
        foreach (var c in FixedCodegenCases.All)
        {
            builds.Add(Compile(dir, c.Name, c.Case.Model, c.Options, gcc, poison));
            builds.Add(Compile(dir, c.Name + "z", c.Case.Model, c.Options, gcc, poison, OptimizeFor.Size));
        }
        builds.Add(Compile(dir, "reefer_int16_s", demo, new FixedPointOptions(), gcc, poison, OptimizeFor.Size));

        output.WriteLine("build | undefined symbols | flash measured / predicted | stack measured / predicted (bytes)");
        foreach (var b in builds)
        {
            output.WriteLine($"{b.Name} | {string.Join(" ", b.Undefined)} | {b.Flash} / {b.Predicted.FlashBytes} | {b.Stack} / {b.Predicted.StackBytes}");
            foreach (var symbol in b.Undefined)
            {
                Assert.False(Forbidden.IsMatch(symbol), $"{b.Name} needs {symbol}");
                Assert.True(Allowed.IsMatch(symbol), $"{b.Name} needs {symbol}, which is not on the list of integer helpers");
            }
            // the prediction: flash within 15 % + 256 bytes; stack an upper bound, and not wildly above
            Assert.True(Math.Abs(b.Flash - b.Predicted.FlashBytes) <= 0.15 * b.Flash + 256,
                $"{b.Name}: flash {b.Flash}, predicted {b.Predicted.FlashBytes}");
            Assert.True(b.Stack <= b.Predicted.StackBytes, $"{b.Name}: stack {b.Stack} above the predicted {b.Predicted.StackBytes}");
            Assert.True(b.Predicted.StackBytes <= 1.5 * b.Stack + 64, $"{b.Name}: predicted stack {b.Predicted.StackBytes} far above the measured {b.Stack}");
        }
    }

    /// <summary>
    /// Fixed mode with streamed scoring and explanations still needs no floating-point, division or libm symbol on
    /// Cortex-M0, and the header's extra flash of each feature (<see cref="FeatureFootprint"/>) is within 15 % + 128
    /// bytes of the measured difference between builds with and without it; the stated stack of NAME_explain is an
    /// upper bound of the measured one and not far above it.
    /// </summary>
    [SkippableFact]
    public void Fixed_c_with_stream_and_explain_stays_integer_only_and_the_header_states_its_cost()
    {
        var gcc = Toolchain.Require("arm-none-eabi-gcc");
        Toolchain.Require("arm-none-eabi-nm");
        var dir = Toolchain.TempDir("m0-features");
        var poison = PoisonHeader(dir);
        var demo = ModelLoader.Load(ReferenceModelPath());
        var cases = new List<(string Name, BoltzmannModel Model, FixedPointOptions Options)>
        {
            ("reefer_a32", demo, new FixedPointOptions(WeightType.Int16, AccumulatorType.Int32)),
            ("reefer_a64", demo, new FixedPointOptions(WeightType.Int16, AccumulatorType.Int64)),
        };
        // a single visible unit lets the compiler fold the loops over units: the model does not cover it (stated)
        cases.AddRange(FixedCodegenCases.All.Where(c => c.Case.Model.Kind != ModelKind.General && c.Case.Model.Visible > 1)
            .Select((c, k) => ("c" + k, c.Case.Model, c.Options)));
        output.WriteLine("case | stream flash measured / predicted | explain flash measured / predicted | explain stack");
        foreach (var (name, model, options) in cases)
        {
            FixedScorerPlan plan;
            try
            {
                plan = FixedScorerPlan.Build(model, new CompileOptions(["c"], NumericMode.Fixed, name, Fixed: options,
                    Explain: true), name + ".json");
            }
            catch (EmitException e) when (e.Message.Contains("accumulator holds", StringComparison.Ordinal))
            {
                output.WriteLine($"{name} | explain refused: {e.Message}");
                continue;
            }
            var plain = Compile(dir, name + "_p", model, options, gcc, poison);
            var stream = Compile(dir, name + "_s", model, options, gcc, poison, stream: true);
            var both = Compile(dir, name + "_e", model, options, gcc, poison, explain: true);
            foreach (var b in new[] { stream, both })
                foreach (var symbol in b.Undefined)
                {
                    Assert.False(Forbidden.IsMatch(symbol), $"{b.Name} needs {symbol}");
                    Assert.True(Allowed.IsMatch(symbol), $"{b.Name} needs {symbol}, which is not an integer helper");
                }
            var d = new Emit.Emission.Dialects.CDialect(plan);
            long streamMeasured = stream.Flash - plain.Flash, explainMeasured = both.Flash - stream.Flash;
            int explainStack = WorstStack(File.ReadAllText(Path.Combine(dir, name + "_e.ci")), name + "_e",
                HelperStack(gcc), ["_explain"]);
            output.WriteLine($"{name} | {streamMeasured} / {d.StreamFlashBytes} | {explainMeasured} / {d.ExplainFlashBytes}" +
                             $" | {explainStack} / {d.ExplainStackBytes}");
            Assert.True(Math.Abs(streamMeasured - d.StreamFlashBytes) <= 0.15 * streamMeasured + 128,
                $"{name}: stream flash {streamMeasured}, predicted {d.StreamFlashBytes}");
            Assert.True(Math.Abs(explainMeasured - d.ExplainFlashBytes) <= 0.15 * explainMeasured + 128,
                $"{name}: explain flash {explainMeasured}, predicted {d.ExplainFlashBytes}");
            Assert.True(explainStack <= d.ExplainStackBytes, $"{name}: explain stack {explainStack} above {d.ExplainStackBytes}");
            Assert.True(d.ExplainStackBytes <= 1.5 * explainStack + 64,
                $"{name}: predicted explain stack {d.ExplainStackBytes} far above the measured {explainStack}");
        }
    }
}
