using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Tests.Emission;

/// <summary>
/// Compile-and-run of the generated fixed-point C: bit-exact against <see cref="FixedPointSimulator"/> on every input,
/// within the proved bound of the double reference scorer (which the reference tests check against brute-force
/// enumeration and numpy), decisions explained by the bound, strict flags with gcc, clang and g++, sanitizers,
/// cppcheck, and no floating point in the compiled code.
/// </summary>
public sealed class GeneratedFixedCTests
{
    public static TheoryData<string> Combos() => FixedCodegenCases.Names();

    [SkippableTheory]
    [MemberData(nameof(Combos))]
    public void Generated_c_gives_the_simulators_integers_and_stays_within_the_bound(string combo) =>
        CheckAgainstSimulator(combo, pointerPasses: false);

    /// <summary>Combinations whose C stores packed rows (speed, int16/int8 weights, int32 accumulator, H >= 16).</summary>
    public static TheoryData<string> PackedCombos()
    {
        var data = new TheoryData<string>();
        foreach (var c in FixedCodegenCases.All)
            if (Emit.Emission.Dialects.CDialect.UsesPackedRows(FixedCodegenCases.Plan(c), OptimizeFor.Speed))
                data.Add(c.Name);
        return data;
    }

    /// <summary>
    /// The row additions that Thumb-2 M-profile cores compile (eight rows per pass through row pointers, lane sums
    /// side by side), chosen here on the host with the file's _ROW_POINTERS macro: the same integers as the simulator.
    /// </summary>
    [SkippableTheory]
    [MemberData(nameof(PackedCombos))]
    public void Pointer_pass_row_additions_give_the_simulators_integers(string combo) =>
        CheckAgainstSimulator(combo, pointerPasses: true);

    /// <summary>
    /// A wide int8 model (410 hidden units: 103 words a row, padded to 104 so the last block of the row additions is
    /// whole vectors) with more than 256 visible units (the 16-bit lanes are emptied every 256 rows, which the
    /// all-ones input and the dense inputs reach): both row-addition shapes give the simulator's integers.
    /// </summary>
    [SkippableFact]
    public void Wide_int8_rows_padded_and_emptied_every_256_rows_give_the_simulators_integers()
    {
        var model = TestModels.Random(ModelKind.Rbm, 300, 410, seed: 41);
        CheckBothShapesAgainstSimulator(model, WeightType.Int8, "wide_i8", [0.13, 0.5, 0.9, 0.97], 4, source =>
        {
            Assert.Contains("#define WIDE_I8_ROW_WORDS 104u\n", source);
            Assert.Contains("The lanes of the last rows go straight into the softplus sum.", source);
        });
    }

    /// <summary>
    /// int8 lane sums fed straight into the softplus loop (more than 32 hidden units): with at most 256 visible units
    /// the lanes never fill, so the scorer has no function that empties them; 50 hidden units make 13 words a row
    /// whose fourth lane is a unit in the first 11 only. Both row-addition shapes give the simulator's integers (the
    /// wide int8 test covers lanes emptied every 256 rows before the last ones go into softplus).
    /// </summary>
    [SkippableFact]
    public void Int8_lanes_into_softplus_give_the_simulators_integers()
    {
        var model = TestModels.Random(ModelKind.Rbm, 40, 50, seed: 59);
        CheckBothShapesAgainstSimulator(model, WeightType.Int8, "lanes_i8", [0.13, 0.5, 0.9], 6, source =>
        {
            Assert.Contains("The lanes of the last rows go straight into the softplus sum.", source);
            Assert.Contains("for (j = 0u; j < 11u; ++j) {", source);
            Assert.DoesNotContain("_empty_lanes(", source);
        });
    }

    /// <summary>
    /// The softplus sum of a speed-optimized int16 scorer: written out unit by unit with literal fraction bits up to
    /// <see cref="Emit.Emission.Dialects.CDialect.UnrolledSoftplusLimit"/> hidden units, a loop over the lane sums
    /// (with the odd last unit on its own) above it; both row-addition shapes give the simulator's integers.
    /// </summary>
    [SkippableTheory]
    [InlineData(32, true)]
    [InlineData(33, false)]
    public void Softplus_sum_unrolled_up_to_the_limit_and_looped_above_gives_the_simulators_integers(int hidden,
        bool unrolled)
    {
        var model = TestModels.Random(ModelKind.Rbm, 40, hidden, seed: 43);
        var plan = FixedPointPlanner.Build(model, new FixedPointOptions(WeightType.Int16, AccumulatorType.Int32));
        Assert.True(plan.Units.Select(u => u.FractionBits).Distinct().Count() > 1, "the units share their fraction bits");
        CheckBothShapesAgainstSimulator(model, WeightType.Int16, "sum_" + hidden, [0.13, 0.5, 0.9], 6, source =>
        {
            Assert.Equal(unrolled, source.Contains("/* unit by unit (few units)", StringComparison.Ordinal));
            Assert.Equal(unrolled, !source.Contains("_fraction_bits[]", StringComparison.Ordinal));
        });
    }

    /// <summary>
    /// The word scan of speed mode, with 64-bit and with 32-bit words (NAME_SCAN_BITS), on inputs shorter than a word,
    /// a word long, ending inside a word and inside a byte: the simulator's integers on the all-off, all-on and random
    /// inputs, and the same from the units entry point while the harness sets the packed bits past the last unit.
    /// </summary>
    [SkippableTheory]
    [InlineData(9)]
    [InlineData(31)]
    [InlineData(32)]
    [InlineData(33)]
    [InlineData(63)]
    [InlineData(64)]
    [InlineData(65)]
    [InlineData(130)]
    public void Word_scan_of_either_width_gives_the_simulators_integers(int visible)
    {
        var model = TestModels.Random(ModelKind.Rbm, visible, 16, seed: 47 + visible);
        var fixedOptions = new FixedPointOptions(WeightType.Int16, AccumulatorType.Int32);
        string name = "scan_" + visible;
        var options = new CompileOptions(["c"], NumericMode.Fixed, name, "Emit.Tests.Generated", 8, null, fixedOptions);
        var sim = new FixedPointSimulator(FixedPointPlanner.Build(model, fixedOptions));
        var rng = new Random(visible);
        var vectors = new List<byte[]> { new byte[visible], Enumerable.Repeat((byte)1, visible).ToArray() };
        foreach (var p in new[] { 0.05, 0.13, 0.5, 0.9 })
            for (int k = 0; k < 6; k++) vectors.Add(TestModels.RandomUnits(visible, rng, p));
        foreach (var bits in new[] { 64, 32 })
        {
            var dir = Toolchain.TempDir($"cscan-{visible}-{bits}");
            foreach (var f in ScorerCompiler.Build(model, name + ".json", options).AllFiles)
                File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
            Assert.Matches($"\n#(el)?if {name.ToUpperInvariant()}_SCAN_BITS == {bits}\n",
                File.ReadAllText(Path.Combine(dir, name + ".c")));
            var exe = CHarness.Build(dir, name, false, $"-D{name.ToUpperInvariant()}_SCAN_BITS={bits}", integer: true);
            var result = CHarness.Run(exe, vectors);
            Assert.Equal(0, result.SelfTestFailures);
            for (int k = 0; k < vectors.Count; k++)
            {
                Assert.True(sim.FreeEnergy(vectors[k]) == result.Rows[k].Integer,
                    $"{name}, {bits}-bit words, vector {k}: generated {result.Rows[k].Integer}, simulator " +
                    $"{sim.FreeEnergy(vectors[k])}");
                Assert.True(result.Rows[k].SameBits, $"{name}, {bits}-bit words, vector {k}: entry points differ");
            }
        }
    }

    /// <summary>
    /// Compiles <paramref name="model"/> (speed, the weights given, int32 accumulator) with both row-addition shapes
    /// (NAME_ROW_POINTERS 0 and 1), checks each source with <paramref name="checkSource"/>, and compares the results
    /// on the all-off and all-on inputs and <paramref name="perDensity"/> random inputs at each density with the
    /// simulator's integers.
    /// </summary>
    private static void CheckBothShapesAgainstSimulator(BoltzmannModel model, WeightType weights, string name,
        double[] densities, int perDensity, Action<string> checkSource)
    {
        var fixedOptions = new FixedPointOptions(weights, AccumulatorType.Int32);
        var options = new CompileOptions(["c"], NumericMode.Fixed, name, "Emit.Tests.Generated", 8, null,
            fixedOptions);
        var sim = new FixedPointSimulator(FixedPointPlanner.Build(model, fixedOptions));
        int v = model.Visible;
        var rng = new Random(model.Hidden);
        var vectors = new List<byte[]> { new byte[v], Enumerable.Repeat((byte)1, v).ToArray() };
        foreach (var p in densities)
            for (int k = 0; k < perDensity; k++) vectors.Add(TestModels.RandomUnits(v, rng, p));
        foreach (var pointers in new[] { 0, 1 })
        {
            var dir = Toolchain.TempDir($"cfix-{name}-{pointers}");
            foreach (var f in ScorerCompiler.Build(model, name + ".json", options).AllFiles)
                File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
            checkSource(File.ReadAllText(Path.Combine(dir, name + ".c")));
            var exe = CHarness.Build(dir, name, false, $"-D{name.ToUpperInvariant()}_ROW_POINTERS={pointers}",
                integer: true);
            var result = CHarness.Run(exe, vectors);
            Assert.Equal(0, result.SelfTestFailures);
            for (int k = 0; k < vectors.Count; k++)
                Assert.True(sim.FreeEnergy(vectors[k]) == result.Rows[k].Integer,
                    $"{name}, pointer passes {pointers}, vector {k}: generated {result.Rows[k].Integer}, simulator " +
                    $"{sim.FreeEnergy(vectors[k])}");
        }
    }

    private static void CheckAgainstSimulator(string combo, bool pointerPasses)
    {
        var c = FixedCodegenCases.Find(combo);
        var plan = FixedCodegenCases.Plan(c);
        var dir = Toolchain.TempDir((pointerPasses ? "cfixp-" : "cfix-") + combo);
        var name = FixedCodegenCases.Generate(c, dir);
        var flags = "";
        if (pointerPasses)
        {
            var macro = Regex.Match(File.ReadAllText(Path.Combine(dir, name + ".c")), @"#ifndef (\w+_ROW_POINTERS)\n");
            Assert.True(macro.Success, "no _ROW_POINTERS switch in " + name + ".c");
            flags = "-D" + macro.Groups[1].Value + "=1";
        }
        var exe = CHarness.Build(dir, name, c.Case.Model.Threshold.HasValue, flags, integer: true);
        var vectors = FixedCodegenCases.Vectors(c);
        var result = CHarness.Run(exe, vectors);
        var sim = new FixedPointSimulator(plan);
        var reference = new ReferenceScorer(c.Case.Model);
        var scorer = FixedScorerPlan.Build(c.Case.Model, FixedCodegenCases.Options(c, "c"), "x.json", plan);

        Assert.Equal(0, result.SelfTestFailures);
        Assert.Equal(vectors.Count, result.Rows.Count);
        for (int k = 0; k < vectors.Count; k++)
        {
            var row = result.Rows[k];
            long expected = sim.FreeEnergy(vectors[k]);
            Assert.True(expected == row.Integer, $"{name} vector {k}: generated {row.Integer}, simulator {expected}");
            Assert.True(row.SameBits, $"{name} vector {k}: packed and units entry points differ");
            double error = Math.Abs(row.Integer / plan.EnergyScale - reference.FreeEnergy(vectors[k]));
            Assert.True(error <= plan.ErrorBound, $"{name} vector {k}: error {error:R} above the stated bound {plan.ErrorBound:R}");
            if (scorer.ThresholdUnits is { } t)
            {
                Assert.Equal(row.Integer > t ? 1 : 0, row.Unusual);
                // the integer comparison is the real comparison of value / 2^E with the model's threshold
                Assert.Equal(row.Integer / plan.EnergyScale > c.Case.Model.Threshold!.Value ? 1 : 0, row.Unusual);
            }
        }
    }

    /// <summary>AddressSanitizer and UndefinedBehaviorSanitizer (signed overflow, shifts, bounds) over every combination.</summary>
    [SkippableFact]
    public void Generated_fixed_c_runs_clean_under_address_and_undefined_behaviour_sanitizers()
    {
        foreach (var c in FixedCodegenCases.All)
        {
            var dir = Toolchain.TempDir("fsan-" + c.Name);
            var name = FixedCodegenCases.Generate(c, dir);
            var exe = CHarness.Build(dir, name, c.Case.Model.Threshold.HasValue,
                "-g -fsanitize=address,undefined,shift,signed-integer-overflow -fno-sanitize-recover=all", integer: true);
            var vectors = FixedCodegenCases.Vectors(c);
            var result = CHarness.Run(exe, vectors.Take(6).Concat(vectors.Skip(vectors.Count - 3)));
            Assert.Equal(0, result.SelfTestFailures);
        }
    }

    [SkippableFact]
    public void Generated_fixed_c_compiles_with_clang_and_as_cpp17_with_strict_flags()
    {
        var clang = Toolchain.Require("clang");
        var gpp = Toolchain.Require("g++");
        var dir = Toolchain.TempDir("fstrict");
        foreach (var c in FixedCodegenCases.All)
        {
            var name = FixedCodegenCases.Generate(c, dir);
            var src = Path.Combine(dir, name + ".c");
            Toolchain.RunOk(clang, [.. Toolchain.Split(Toolchain.StrictC), "-O2", "-c", src, "-o", Path.Combine(dir, name + ".clang.o")]);
            Toolchain.RunOk(gpp, [.. Toolchain.Split(Toolchain.StrictCpp), "-c", src, "-o", Path.Combine(dir, name + ".cpp.o")]);
        }
    }

    [SkippableFact]
    public void Cppcheck_reports_nothing_on_generated_fixed_c()
    {
        var cppcheck = Toolchain.Require("cppcheck");
        var dir = Toolchain.TempDir("fcppcheck");
        var sources = FixedCodegenCases.All.Where(c => c.Weights == WeightType.Int16 || c.Case.Id == "lat_a")
            .Select(c => Path.Combine(dir, FixedCodegenCases.Generate(c, dir) + ".c")).ToList();
        var (exit, output, err) = Toolchain.Run(cppcheck, ["-q", "--enable=warning,style,portability,performance", "--std=c99", "--error-exitcode=1", "-I", dir, .. sources]);
        Assert.True(exit == 0 && err.Trim().Length == 0, output + err);
    }

    /// <summary>
    /// No floating point reaches the compiled code: with float and double poisoned (any use is a compile error) and
    /// -Wdouble-promotion -Wfloat-conversion, the source compiles; after preprocessing it holds no floating literal
    /// (the header's two double macros are for callers and are never expanded in NAME.c); and it has no division
    /// or remainder operator.
    /// </summary>
    [SkippableFact]
    public void Generated_fixed_c_holds_no_floating_point_and_no_division()
    {
        var cc = Toolchain.Require("cc");
        var dir = Toolchain.TempDir("fnofloat");
        var poison = Path.Combine(dir, "poison.h");
        File.WriteAllText(poison, "#pragma GCC poison float double\n");
        foreach (var c in FixedCodegenCases.All)
        {
            var name = FixedCodegenCases.Generate(c, dir);
            var src = Path.Combine(dir, name + ".c");
            Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), "-Wdouble-promotion", "-Wfloat-conversion", "-include", poison, "-O2", "-c", src, "-o", Path.Combine(dir, name + ".o")]);
            var pre = Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), "-E", "-P", src]);
            // the generated code's own part starts at its first typedef (before it: stdint.h)
            var code = pre[pre.LastIndexOf("typedef", pre.IndexOf(name + "_acc_t;", StringComparison.Ordinal), StringComparison.Ordinal)..];
            Assert.DoesNotMatch(@"\b\d+\.\d*|\.\d+|\b\d+[eE][+-]?\d+\b", code);
            Assert.DoesNotMatch(@"\b(float|double)\b", code);
            // divisions only in constant expressions the compiler evaluates: table-length checks and the packed size
            var runtime = Regex.Replace(code, @"(?ms)^typedef char \w+\[.*?\];$", "");
            runtime = Regex.Replace(runtime, @"\(\(\d+ \+ 7\) / 8\)", "");
            Assert.DoesNotMatch(@"/|%", runtime);
        }
    }

    [SkippableFact]
    public void Hostile_unit_names_cannot_break_out_of_fixed_mode_comments()
    {
        var cc = Toolchain.Require("cc");
        var m = CodegenCases.WithNames(TestModels.Random(ModelKind.Lateral, CodegenCases.HostileNames.Length, 4, seed: 5), CodegenCases.HostileNames);
        var dir = Toolchain.TempDir("fhostile");
        foreach (var f in ScorerCompiler.Build(m, "*/ evil\n#define model.json", new CompileOptions(["c", "csharp"], NumericMode.Fixed, "hostile")).AllFiles)
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var pre = Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), "-E", "-P", Path.Combine(dir, "hostile.c")]);
        Assert.DoesNotContain("injected", pre);
        Assert.DoesNotContain("broken", pre);
        var result = CHarness.Run(CHarness.Build(dir, "hostile", false, integer: true), [new byte[m.Visible]]);
        Assert.Equal(0, result.SelfTestFailures);
    }

    /// <summary>The self-test must notice a damaged table: one weight changed by one LSB (as a flash bit error might).</summary>
    [SkippableFact]
    public void Fixed_self_test_fails_when_a_weight_is_damaged()
    {
        var c = FixedCodegenCases.All.Single(x => x.Name == "lat_a_int16_int32");
        var dir = Toolchain.TempDir("fdamaged");
        var name = FixedCodegenCases.Generate(c, dir);
        var path = Path.Combine(dir, name + ".c");
        var text = File.ReadAllText(path);
        int table = text.IndexOf($"{name}_weights[", StringComparison.Ordinal);
        var literal = Regex.Match(text[table..], @"\n    (-?\d+),");
        int at = table + literal.Groups[1].Index;
        long value = long.Parse(literal.Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture);
        File.WriteAllText(path, text[..at] + (value ^ 1).ToString(System.Globalization.CultureInfo.InvariantCulture) + text[(at + literal.Groups[1].Length)..]);
        var result = CHarness.Run(CHarness.Build(dir, name, true, integer: true), [new byte[c.Case.Model.Visible]]);
        Assert.True(result.SelfTestFailures > 0, "the self-test passed with a damaged weight");
    }

    [SkippableFact]
    public void Mismatched_fixed_point_options_refuse_to_compile()
    {
        var cc = Toolchain.Require("cc");
        var dir = Toolchain.TempDir("fmismatch");
        var c = CodegenCases.All.Single(x => x.Id == "rbm_b");
        var a = ScorerCompiler.Compile(c.Model, "a.json", new CompileOptions(["c"], NumericMode.Fixed, "same", Fixed: new FixedPointOptions(WeightType.Int16)));
        var b = ScorerCompiler.Compile(c.Model, "a.json", new CompileOptions(["c"], NumericMode.Fixed, "same", Fixed: new FixedPointOptions(WeightType.Int8)));
        File.WriteAllText(Path.Combine(dir, "same.h"), b.Single(f => f.FileName == "same.h").Text);
        File.WriteAllText(Path.Combine(dir, "same.c"), a.Single(f => f.FileName == "same.c").Text);
        var (exit, _, err) = Toolchain.Run(cc, [.. Toolchain.Split(Toolchain.StrictC), "-c", Path.Combine(dir, "same.c"), "-o", Path.Combine(dir, "same.o")]);
        Assert.NotEqual(0, exit);
        Assert.Contains("other fixed-point options", err);
    }
}
