using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Emission;

/// <summary>
/// What a firmware reviewer checks in generated C and C#, over every codegen case, mode, target and optimization:
/// compile-time checks that can fail, constants that do not promote to double, no template artefacts, lines of at most
/// 120 characters, documented prototypes, the licence hook, and that <c>--optimize size</c> changes the code but not
/// one result. Compiler behaviour is judged by gcc (Debian); the 120-column limit is common practice for reviewed code.
/// </summary>
public sealed class GeneratedCodeReviewTests
{
    private static readonly NumericMode[] Modes = [NumericMode.F32, NumericMode.F64, NumericMode.Fixed];

    private static IEnumerable<GeneratedFile> All()
    {
        foreach (var c in CodegenCases.All)
            foreach (var mode in Modes)
                foreach (var optimize in new[] { OptimizeFor.Speed, OptimizeFor.Size })
                    foreach (var f in ScorerCompiler.Compile(c.Model, c.Id + ".json",
                                 new CompileOptions(["c", "csharp"], mode, c.Id + "_" + mode.ToText(), "Emit.Tests.Generated", Optimize: optimize)))
                        yield return f;
    }

    [Fact]
    public void Lines_are_short_and_free_of_template_artefacts()
    {
        var problems = new SortedSet<string>(StringComparer.Ordinal);
        foreach (var f in All())
        {
            var lines = f.Text.Split('\n');
            for (int k = 0; k < lines.Length; k++)
            {
                if (lines[k].Length > 120) problems.Add($"{f.FileName}:{k + 1} has {lines[k].Length} characters: {lines[k]}");
                if (lines[k].EndsWith(' ')) problems.Add($"{f.FileName}:{k + 1} ends in a space");
            }
            Assert.DoesNotMatch(@"\w - \(-?\d+\)", f.Text);                 // f - (4), f - (-4)
            Assert.DoesNotMatch(@"\((int|long|int32_t|int64_t)\)\d+ <<", f.Text); // (int)1 << d
            Assert.DoesNotMatch(@"\[\d+ \+ 1\]", f.Text);                    // [256 + 1]
            Assert.DoesNotMatch(@"=\s*\{\s*0\s*,\s*0", f.Text);              // null pointers written as 0
            Assert.DoesNotContain("\n\n\n", f.Text);
            Assert.DoesNotContain("{{", f.Text);
            if (f.FileName.EndsWith(".cs", StringComparison.Ordinal))
                Assert.DoesNotMatch(@"\b(u?int(8|16|32|64)_t)\b", f.Text);   // C# comments name C# types
        }
        Assert.True(problems.Count == 0, string.Join("\n", problems.Take(40)));
    }

    [Fact]
    public void Every_prototype_in_a_header_has_a_doxygen_comment()
    {
        foreach (var f in All().Where(f => f.FileName.EndsWith(".h", StringComparison.Ordinal)))
        {
            var lines = f.Text.Split('\n');
            var prototypes = Enumerable.Range(0, lines.Length).Where(k => Regex.IsMatch(lines[k], @"^\w[\w ]*\b\w+\(.*\);$")).ToList();
            Assert.Equal(f.Text.Contains("_is_unusual(", StringComparison.Ordinal) ? 4 : 3, prototypes.Count);
            foreach (int k in prototypes)
            {
                Assert.Equal(" */", lines[k - 1]);
                int open = k - 1;
                while (!lines[open].StartsWith("/*", StringComparison.Ordinal)) open--;
                Assert.Equal("/**", lines[open]);
                Assert.Contains("@brief", string.Join("\n", lines[open..k]));
                Assert.Contains("@return", string.Join("\n", lines[open..k]));
            }
            if (f.Text.Contains("_ACC_BITS", StringComparison.Ordinal))
            {
                int at = f.Text.IndexOf("_free_energy(const uint8_t packed", StringComparison.Ordinal);
                Assert.Contains("Scaling and overflow", f.Text[f.Text.LastIndexOf("/**", at, StringComparison.Ordinal)..at]);
            }
        }
    }

    [Fact]
    public void The_header_states_options_footprint_and_dependencies()
    {
        var c = CodegenCases.All.Single(x => x.Id == "lat_a");
        foreach (var mode in Modes)
            foreach (var optimize in new[] { OptimizeFor.Speed, OptimizeFor.Size })
            {
                var h = ScorerCompiler.Compile(c.Model, "lat_a.json", new CompileOptions(["c"], mode, "lat", Optimize: optimize))[0].Text;
                Assert.Contains("--optimize " + optimize.ToText(), h);
                Assert.Matches(@"#define LAT_FLASH_BYTES \d+\n#define LAT_STACK_BYTES \d+\n", h);
                Assert.Contains(mode == NumericMode.Fixed ? "Cortex-M0" : "Cortex-M4F", h);
                Assert.Contains(mode switch
                {
                    NumericMode.F32 => "no libm function", // the softplus polynomial (SoftplusF32)
                    NumericMode.F64 => "exp, log, fabs from the C maths library",
                    _ => "no libm function",
                }, h);
                Assert.Contains("memcpy and memset", h);
            }
    }

    [Fact]
    public void Each_file_lists_the_templates_it_was_laid_out_from()
    {
        var c = CodegenCases.All.Single(x => x.Id == "rbm_a");
        var files = ScorerCompiler.Compile(c.Model, "m.json", new CompileOptions(["c", "csharp"], NumericMode.Fixed, "m"));
        Assert.Equal(["c/scorer.h.sbn", "c/common.c.sbn", "c/licence.sbn"], files[0].Templates.Select(t => t.Name));
        Assert.Equal(["c/scorer-fixed.c.sbn", "c/common.c.sbn", "c/licence.sbn"], files[1].Templates.Select(t => t.Name));
        Assert.Equal(["csharp/scorer-fixed.cs.sbn", "csharp/common.cs.sbn", "csharp/licence.sbn"], files[2].Templates.Select(t => t.Name));
        Assert.All(files.SelectMany(f => f.Templates), t => Assert.False(t.IsOverride));
        Assert.All(files.SelectMany(f => f.Templates), t => Assert.NotEmpty(t.Text));
    }

    [Fact]
    public void The_licence_hook_puts_its_line_first_in_every_file()
    {
        var dir = Toolchain.TempDir("licence");
        Directory.CreateDirectory(Path.Combine(dir, "c"));
        Directory.CreateDirectory(Path.Combine(dir, "csharp"));
        File.WriteAllText(Path.Combine(dir, "c", "licence.sbn"), "/* SPDX-License-Identifier: MIT */\n");
        File.WriteAllText(Path.Combine(dir, "csharp", "licence.sbn"), "// SPDX-License-Identifier: MIT\n");
        var c = CodegenCases.All.Single(x => x.Id == "lat_a");
        foreach (var mode in Modes)
        {
            var files = ScorerCompiler.Compile(c.Model, "m.json", new CompileOptions(["c", "csharp"], mode, "m", TemplatesDirectory: dir));
            Assert.Equal(3, files.Count);
            foreach (var f in files)
            {
                Assert.StartsWith(f.FileName.EndsWith(".cs", StringComparison.Ordinal) ? "// SPDX-License-Identifier: MIT\n" : "/* SPDX-License-Identifier: MIT */\n", f.Text);
                Assert.Contains(f.Templates, t => t.Name.EndsWith("/licence.sbn", StringComparison.Ordinal) && t.IsOverride);
            }
            // the shipped hook prints nothing
            foreach (var f in ScorerCompiler.Compile(c.Model, "m.json", new CompileOptions(["c", "csharp"], mode, "m")))
                Assert.StartsWith(f.FileName.EndsWith(".cs", StringComparison.Ordinal) ? "// <auto-generated/>\n" : "/*\n * m.", f.Text);
        }
    }

    /// <summary>Deletes the first entry of a table: the [] declaration then holds one entry too few.</summary>
    private static string Shorten(string source, string table)
    {
        int at = source.IndexOf(table + "[] ", StringComparison.Ordinal);
        Assert.True(at > 0, table);
        int line = source.IndexOf('\n', at) + 1;
        while (source[line..].StartsWith("    /*", StringComparison.Ordinal)) line = source.IndexOf('\n', line) + 1;
        int comma = source.IndexOf(',', line);
        return source[..line] + "    " + source[(comma + 1)..].TrimStart(' ');
    }

    [SkippableTheory]
    [InlineData(NumericMode.F32, "-std=c99")]
    [InlineData(NumericMode.F32, "-std=c11")]
    [InlineData(NumericMode.Fixed, "-std=c99")]
    [InlineData(NumericMode.Fixed, "-std=c11")]
    public void A_short_table_does_not_compile(NumericMode mode, string std)
    {
        var cc = Toolchain.Require("cc");
        var c = CodegenCases.All.Single(x => x.Id == "lat_a");
        var dir = Toolchain.TempDir("short-" + mode.ToText() + std);
        var name = CodegenCases.Generate(c, mode, dir);
        var path = Path.Combine(dir, name + ".c");
        string[] flags = [std, "-Wall", "-Wextra", "-Wpedantic", "-Werror", "-c", path, "-o", Path.Combine(dir, name + ".o")];
        Assert.Equal(0, Toolchain.Run(cc, flags).Exit);   // as generated, it compiles
        var text = File.ReadAllText(path);
        foreach (var table in new[] { "_visible_bias", "_weights", "_link_weight" })
        {
            File.WriteAllText(path, Shorten(text, name + table));
            var (exit, _, err) = Toolchain.Run(cc, flags);
            Assert.NotEqual(0, exit);
            Assert.Contains(std == "-std=c11" ? "static assertion failed" : "negative", err);
        }
    }

    [SkippableFact]
    public void F32_constants_compare_with_a_float_without_promotion_to_double()
    {
        var cc = Toolchain.Require("cc");
        var c = CodegenCases.All.Single(x => x.Id == "lat_a");
        var dir = Toolchain.TempDir("promotion");
        var name = CodegenCases.Generate(c, NumericMode.F32, dir);
        var u = Naming.MacroPrefix(name);
        string Caller(string extra) =>
            $"#include \"{name}.h\"\nint check(float f);\nint check(float f)\n{{\n    return (f > {u}_THRESHOLD) + (f < {u}_ERROR_BOUND) + (f / {u}_ENERGY_SCALE > {extra});\n}}\n";
        string[] flags = [.. Toolchain.Split(Toolchain.StrictC), "-Wdouble-promotion", "-I", dir, "-c", Path.Combine(dir, "caller.c"), "-o", Path.Combine(dir, "caller.o")];
        File.WriteAllText(Path.Combine(dir, "caller.c"), Caller("0.0f"));
        var (exit, _, err) = Toolchain.Run(cc, flags);
        Assert.True(exit == 0, err);
        // the flag does catch a double constant (control)
        File.WriteAllText(Path.Combine(dir, "caller.c"), Caller("0.0"));
        Assert.NotEqual(0, Toolchain.Run(cc, flags).Exit);
    }

    public static TheoryData<string> OptimizeCombos() => new() { "rbm_d_int16_int32", "rbm_d_int8_int64", "lat_a_int32_int64", "gen_a_int16_int32" };

    [SkippableTheory]
    [MemberData(nameof(OptimizeCombos))]
    public void Optimizing_for_size_changes_the_code_but_not_one_result(string combo)
    {
        var c = FixedCodegenCases.Find(combo);
        var dir = Toolchain.TempDir("optimize-" + combo);
        var results = new List<IReadOnlyList<CHarness.Row>>();
        var texts = new List<string>();
        foreach (var optimize in new[] { OptimizeFor.Speed, OptimizeFor.Size })
        {
            var name = combo + (optimize == OptimizeFor.Size ? "z" : "p");   // within the 18 characters a scorer name may have
            var options = FixedCodegenCases.Options(c, "c", name) with { Optimize = optimize };
            foreach (var f in ScorerCompiler.Build(c.Case.Model, name + ".json", options).AllFiles)
                File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
            var built = CHarness.Build(dir, name, c.Case.Model.Threshold.HasValue, integer: true);
            var run = CHarness.Run(built, FixedCodegenCases.Vectors(c));
            Assert.Equal(0, run.SelfTestFailures);
            results.Add(run.Rows);
            texts.Add(File.ReadAllText(Path.Combine(dir, name + ".c")));
        }
        Assert.Equal(results[0].Select(r => r.Integer), results[1].Select(r => r.Integer));
        Assert.Equal(results[0].Select(r => r.Unusual), results[1].Select(r => r.Unusual));
        if (c.Case.Model.Hidden > 0 && c.Weights.Bits() < c.Accumulator.Bits())
        {
            Assert.Contains("waiting[count]", texts[0]);
            Assert.DoesNotContain("waiting[count]", texts[1]);
        }
    }
}
