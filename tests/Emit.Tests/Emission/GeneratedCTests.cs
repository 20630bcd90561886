using System.Collections.Immutable;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Tests.Emission;

/// <summary>
/// Compile-and-run: the generated C, built with the strict flags, against the double-precision reference scorer
/// (which the reference tests check against brute-force enumeration of the Boltzmann distribution).
/// </summary>
public sealed class GeneratedCTests
{
    /// <summary>Relative tolerances per float mode, stated once.</summary>
    public static double RelativeTolerance(NumericMode mode) => mode == NumericMode.F64 ? 1e-9 : 1e-4;

    public static TheoryData<string, NumericMode> Cases()
    {
        var data = new TheoryData<string, NumericMode>();
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
                data.Add(c.Id, mode);
        return data;
    }

    [SkippableTheory]
    [MemberData(nameof(Cases))]
    public void Generated_c_matches_the_reference_scorer_within_the_mode_tolerance_and_its_error_bound(string id, NumericMode mode)
    {
        var c = CodegenCases.All.Single(x => x.Id == id);
        var dir = Toolchain.TempDir("c-" + id);
        var name = CodegenCases.Generate(c, mode, dir);
        var exe = CHarness.Build(dir, name, c.Model.Threshold.HasValue);
        var vectors = CodegenCases.Vectors(c);
        var result = CHarness.Run(exe, vectors);
        var reference = new ReferenceScorer(c.Model);

        Assert.Equal(0, result.SelfTestFailures);
        Assert.Equal(vectors.Count, result.Rows.Count);
        double rel = RelativeTolerance(mode);
        double threshold = c.Model.Threshold is { } t ? Literals.Round(t, mode, "threshold") : 0;
        for (int k = 0; k < vectors.Count; k++)
        {
            var row = result.Rows[k];
            double expected = reference.FreeEnergy(vectors[k]);
            double error = Math.Abs(row.Energy - expected);
            Assert.True(error <= rel * Math.Max(1.0, Math.Abs(expected)),
                $"{name} vector {k}: generated {row.Energy:R}, reference {expected:R}, relative tolerance {rel}");
            double bound = FloatErrorBound.ForVector(c.Model, mode, vectors[k]) + FloatErrorBound.Reference(c.Model, vectors[k]);
            Assert.True(error <= bound, $"{name} vector {k}: error {error:R} is above the stated bound {bound:R}");
            Assert.True(row.SameBits, $"{name} vector {k}: packed and units entry points differ");
            if (c.Model.Threshold.HasValue) Assert.Equal(row.Energy > threshold ? 1 : 0, row.Unusual);
        }
    }

    /// <summary>
    /// The word scan of speed mode with 64-bit and with 32-bit words (NAME_SCAN_BITS) takes the set bits in the same
    /// order, so the float results have the same bits; both within the stated bound of the reference scorer, on
    /// inputs ending inside a word and inside a byte (the harness sets the packed bits past the last unit).
    /// </summary>
    [SkippableTheory]
    [InlineData(33, NumericMode.F32)]
    [InlineData(130, NumericMode.F32)]
    [InlineData(130, NumericMode.F64)]
    public void Word_scan_of_either_width_gives_the_same_bits_within_the_bound(int visible, NumericMode mode)
    {
        var model = TestModels.Random(ModelKind.Rbm, visible, 20, seed: 53 + visible);
        string name = $"fscan_{visible}_{mode.ToString().ToLowerInvariant()}";
        var options = new CompileOptions(["c"], mode, name);
        var rng = new Random(visible);
        var vectors = new List<byte[]> { new byte[visible], Enumerable.Repeat((byte)1, visible).ToArray() };
        foreach (var p in new[] { 0.05, 0.13, 0.5, 0.9 })
            for (int k = 0; k < 6; k++) vectors.Add(TestModels.RandomUnits(visible, rng, p));
        var reference = new ReferenceScorer(model);
        var results = new List<CHarness.Result>();
        foreach (var bits in new[] { 64, 32 })
        {
            var dir = Toolchain.TempDir($"cfscan-{visible}-{bits}");
            foreach (var f in ScorerCompiler.Build(model, name + ".json", options).AllFiles)
                File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
            var exe = CHarness.Build(dir, name, false, $"-D{name.ToUpperInvariant()}_SCAN_BITS={bits}");
            var result = CHarness.Run(exe, vectors);
            Assert.Equal(0, result.SelfTestFailures);
            for (int k = 0; k < vectors.Count; k++)
            {
                double error = Math.Abs(result.Rows[k].Energy - reference.FreeEnergy(vectors[k]));
                double bound = FloatErrorBound.ForVector(model, mode, vectors[k]) + FloatErrorBound.Reference(model, vectors[k]);
                Assert.True(error <= bound, $"{name}, {bits}-bit words, vector {k}: error {error:R} above {bound:R}");
                Assert.True(result.Rows[k].SameBits, $"{name}, {bits}-bit words, vector {k}: entry points differ");
            }
            results.Add(result);
        }
        Assert.Equal(results[0].Rows.Select(r => r.Energy), results[1].Rows.Select(r => r.Energy));
    }

    /// <summary>
    /// Float row additions: speed mode's pass of eight rows adds two groups of four in turn, acc = (acc + ((r0 + r1) +
    /// (r2 + r3))) + ((r4 + r5) + (r6 + r7)), which rounds exactly as two passes of four (acc += (r0 + r1) + (r2 + r3),
    /// then the same for r4..r7, as size mode and earlier versions add): the generated C and a copy whose pass is
    /// rewritten as those two statements return the same bits, on inputs with every count of set bits up to 40.
    /// </summary>
    [SkippableTheory]
    [InlineData(NumericMode.F32)]
    [InlineData(NumericMode.F64)]
    public void A_pass_of_eight_float_rows_rounds_as_two_passes_of_four(NumericMode mode)
    {
        var model = TestModels.Random(ModelKind.Rbm, 40, 24, seed: 61);
        var rng = new Random(61);
        var vectors = new List<byte[]> { new byte[40] };
        for (int on = 1; on <= 40; on++)
        {
            var v = new byte[40];
            foreach (int i in Enumerable.Range(0, 40).OrderBy(_ => rng.Next()).Take(on)) v[i] = 1;
            vectors.Add(v);
        }
        string name = $"passes_{mode.ToString().ToLowerInvariant()}";
        const string pass = "acc[j] = (acc[j] + ((r0[j] + r1[j]) + (r2[j] + r3[j]))) + ((r4[j] + r5[j]) + (r6[j] + r7[j]));";
        const string twoPasses = "acc[j] += (r0[j] + r1[j]) + (r2[j] + r3[j]); acc[j] += (r4[j] + r5[j]) + (r6[j] + r7[j]);";
        var results = new List<CHarness.Result>();
        foreach (bool rewritten in new[] { false, true })
        {
            var dir = Toolchain.TempDir($"cpasses-{mode}-{rewritten}");
            foreach (var f in ScorerCompiler.Build(model, name + ".json", new CompileOptions(["c"], mode, name)).AllFiles)
                File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
            var path = Path.Combine(dir, name + ".c");
            var source = File.ReadAllText(path);
            Assert.Contains(pass, source);
            if (rewritten) File.WriteAllText(path, source.Replace(pass, twoPasses, StringComparison.Ordinal));
            var result = CHarness.Run(CHarness.Build(dir, name, false), vectors);
            Assert.Equal(0, result.SelfTestFailures);
            results.Add(result);
        }
        for (int k = 0; k < vectors.Count; k++)
            Assert.True(results[0].Rows[k].Energy.Equals(results[1].Rows[k].Energy),
                $"vector {k}: one pass {results[0].Rows[k].Energy:R}, two {results[1].Rows[k].Energy:R}");
    }

    /// <summary>
    /// Worked example (common practice; derived by hand, see ReferenceScorerTests): 2 visible, 2 hidden, W(v1,h1) = 2,
    /// W(v2,h2) = 1, M(h1,h2) = −1, no biases. With a = W·v the hidden states 00, 10, 01, 11 score 0, a1, a2, a1 + a2 − 1:
    /// F(0,0) = −log(3 + e⁻¹), F(1,1) = −log(1 + e + 2e²), F(1,0) = −log(2 + e + e²).
    /// </summary>
    [SkippableTheory]
    [InlineData(NumericMode.F64)]
    [InlineData(NumericMode.F32)]
    public void Worked_example_general_model_matches_the_hand_computed_free_energy(NumericMode mode)
    {
        var m = new BoltzmannModel(ModelKind.General, 2, 2, [0, 0], [0, 0], [2, 0, 0, 1], ImmutableArray<Link>.Empty, [new Link(0, 1, -1)]);
        var dir = Toolchain.TempDir("worked");
        var name = "worked_" + mode.ToText();
        foreach (var f in ScorerCompiler.Build(m, "worked.json", new CompileOptions(["c"], mode, name)).AllFiles)
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var result = CHarness.Run(CHarness.Build(dir, name, false), [[0, 0], [1, 1], [1, 0]]);
        double e = Math.E, rel = RelativeTolerance(mode);
        double[] expected = [-Math.Log(3 + 1 / e), -Math.Log(1 + e + 2 * e * e), -Math.Log(2 + e + e * e)];
        for (int k = 0; k < 3; k++)
            Assert.True(Math.Abs(result.Rows[k].Energy - expected[k]) <= rel * Math.Abs(expected[k]), $"F[{k}] = {result.Rows[k].Energy:R}, expected {expected[k]:R}");
    }

    /// <summary>AddressSanitizer and UndefinedBehaviorSanitizer over every kind and mode.</summary>
    [SkippableFact]
    public void Generated_c_runs_clean_under_address_and_undefined_behaviour_sanitizers()
    {
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
            {
                var dir = Toolchain.TempDir("sanitize-" + c.Id);
                var name = CodegenCases.Generate(c, mode, dir);
                var exe = CHarness.Build(dir, name, c.Model.Threshold.HasValue, "-g -fsanitize=address,undefined -fno-sanitize-recover=all");
                var result = CHarness.Run(exe, CodegenCases.Vectors(c).Take(10));
                Assert.Equal(0, result.SelfTestFailures);
            }
    }

    [SkippableFact]
    public void Cppcheck_reports_nothing_on_generated_c()
    {
        var cppcheck = Toolchain.Require("cppcheck");
        var dir = Toolchain.TempDir("cppcheck");
        var sources = new List<string>();
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
                sources.Add(Path.Combine(dir, CodegenCases.Generate(c, mode, dir) + ".c"));
        var (exit, output, err) = Toolchain.Run(cppcheck, ["-q", "--enable=warning,style,portability,performance", "--std=c99", "--error-exitcode=1", "-I", dir, .. sources]);
        Assert.True(exit == 0 && err.Trim().Length == 0, output + err);
    }

    [SkippableFact]
    public void Generated_c_compiles_with_clang_strict_flags_for_every_kind_and_mode()
    {
        var clang = Toolchain.Require("clang");
        var dir = Toolchain.TempDir("clang");
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
            {
                var name = CodegenCases.Generate(c, mode, dir);
                Toolchain.RunOk(clang, [.. Toolchain.Split(Toolchain.StrictC), "-O2", "-c", Path.Combine(dir, name + ".c"), "-o", Path.Combine(dir, name + ".o")]);
            }
    }

    [SkippableFact]
    public void Generated_c_compiles_as_cpp17_with_strict_flags_for_every_kind_and_mode()
    {
        var gpp = Toolchain.Require("g++");
        var dir = Toolchain.TempDir("cpp");
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
            {
                var name = CodegenCases.Generate(c, mode, dir);
                Toolchain.RunOk(gpp, [.. Toolchain.Split(Toolchain.StrictCpp), "-c", Path.Combine(dir, name + ".c"), "-o", Path.Combine(dir, name + ".o")]);
            }
    }

    [SkippableFact]
    public void Hostile_unit_names_cannot_break_out_of_comments_and_the_code_still_compiles_and_passes()
    {
        var cc = Toolchain.Require("cc");
        var m = CodegenCases.WithNames(TestModels.Random(ModelKind.Lateral, CodegenCases.HostileNames.Length, 4, seed: 5), CodegenCases.HostileNames);
        var dir = Toolchain.TempDir("hostile");
        foreach (var f in ScorerCompiler.Build(m, "*/ evil\n#define model.json", new CompileOptions(["c", "csharp"], NumericMode.F32, "hostile")).AllFiles)
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        // -Wcomment (in -Wall) rejects "/*" inside a comment and backslash-newline in a // comment; -Wtrigraphs rejects
        // trigraphs that would change the program. The preprocessed source must also hold no injected tokens.
        var pre = Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), "-E", "-P", Path.Combine(dir, "hostile.c")]);
        Assert.DoesNotContain("injected", pre);
        Assert.DoesNotContain("broken", pre);
        var result = CHarness.Run(CHarness.Build(dir, "hostile", false), [new byte[m.Visible]]);
        Assert.Equal(0, result.SelfTestFailures);
        foreach (var file in new[] { "hostile.h", "hostile.c", "hostile.cs" })
        {
            var text = File.ReadAllText(Path.Combine(dir, file));
            Assert.DoesNotContain('\\', text.Replace("\\n\"", "", StringComparison.Ordinal).Replace("'\\n'", "", StringComparison.Ordinal));
            Assert.DoesNotContain("??", text);
            Assert.All(text, ch => Assert.True(ch == '\n' || (ch >= ' ' && ch < 0x7F) || file.EndsWith(".cs", StringComparison.Ordinal), $"{file}: character U+{(int)ch:X4}"));
            foreach (var line in text.Split('\n'))
                Assert.False(line.TrimStart().StartsWith("#define broken", StringComparison.Ordinal) || line.TrimStart().StartsWith("#error x", StringComparison.Ordinal), $"{file}: {line}");
        }
    }

    [SkippableFact]
    public void Section_hook_places_every_table_in_the_named_section()
    {
        var cc = Toolchain.Require("cc");
        Skip.If(Toolchain.Find("objdump") is null, "objdump is not installed");
        var c = CodegenCases.All.Single(x => x.Id == "lat_a");
        var dir = Toolchain.TempDir("section");
        var name = CodegenCases.Generate(c, NumericMode.F32, dir);
        var obj = Path.Combine(dir, name + ".o");
        // -O0: at higher levels the compiler may fold a small table into code, leaving no symbol to look at
        Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), "-O0", "-c", $"-D{name.ToUpperInvariant()}_TABLE_ATTR=__attribute__((section(\".emit_tables\")))",
            Path.Combine(dir, name + ".c"), "-o", obj]);
        var symbols = Toolchain.RunOk(Toolchain.Find("objdump")!, ["-t", obj]);
        foreach (var table in new[] { "visible_bias", "hidden_bias", "weights", "link_start", "link_other", "link_weight", "selftest_inputs", "selftest_expected", "selftest_tolerance" })
            Assert.Matches($@"\.emit_tables\s+\S+\s+{name}_{table}\b", symbols);
    }

    /// <summary>The self-test must notice a damaged table: one weight changed by 0.01 (as a flash bit error might).</summary>
    [SkippableTheory]
    [InlineData(NumericMode.F32)]
    [InlineData(NumericMode.F64)]
    public void Self_test_fails_when_a_weight_is_damaged(NumericMode mode)
    {
        var c = CodegenCases.All.Single(x => x.Id == "lat_a");
        var dir = Toolchain.TempDir("damaged");
        var name = CodegenCases.Generate(c, mode, dir);
        var path = Path.Combine(dir, name + ".c");
        var text = File.ReadAllText(path);
        int table = text.IndexOf($"{name}_weights[", StringComparison.Ordinal);
        var literal = System.Text.RegularExpressions.Regex.Match(text[table..], @"\n    (-?[0-9][0-9.e+-]*)f?,");
        int at = table + literal.Groups[1].Index;
        double value = double.Parse(literal.Groups[1].Value, System.Globalization.CultureInfo.InvariantCulture);
        var damaged = Literals.Of(value + 0.01, mode);
        File.WriteAllText(path, text[..at] + damaged.TrimEnd('f') + text[(at + literal.Groups[1].Length)..]);
        var result = CHarness.Run(CHarness.Build(dir, name, true), [new byte[c.Model.Visible]]);
        Assert.True(result.SelfTestFailures > 0, "the self-test passed with a damaged weight");
    }

    [SkippableFact]
    public void Mismatched_header_and_source_refuse_to_compile()
    {
        var cc = Toolchain.Require("cc");
        var dir = Toolchain.TempDir("mismatch");
        var a = CodegenCases.All.Single(x => x.Id == "rbm_b");
        var b = CodegenCases.All.Single(x => x.Id == "lat_b");
        var files = ScorerCompiler.Compile(a.Model, "a.json", new CompileOptions(["c"], NumericMode.F32, "same"));
        var other = ScorerCompiler.Compile(b.Model, "b.json", new CompileOptions(["c"], NumericMode.F32, "same"));
        File.WriteAllText(Path.Combine(dir, "same.h"), other.Single(f => f.FileName == "same.h").Text);
        File.WriteAllText(Path.Combine(dir, "same.c"), files.Single(f => f.FileName == "same.c").Text);
        var (exit, _, err) = Toolchain.Run(cc, [.. Toolchain.Split(Toolchain.StrictC), "-c", Path.Combine(dir, "same.c"), "-o", Path.Combine(dir, "same.o")]);
        Assert.NotEqual(0, exit);
        Assert.Contains("generated from another model", err);
    }
}
