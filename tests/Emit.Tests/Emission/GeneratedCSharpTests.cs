using System.Globalization;
using System.Text;
using Emit.Emission;
using Emit.Harness;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Tests.Emission;

/// <summary>
/// Builds the generated C# of every test model and mode in ONE temporary console project (dotnet build is slow) with the
/// library's project builder (<see cref="CSharpProject"/>: nullable enabled; here warnings as errors and C# 12, the
/// language version of net8.0), then runs it over the test vectors. The results are shared by the tests of this class.
/// </summary>
public sealed class CSharpBuildFixture
{
    public sealed record Row(double Energy, bool SameBits, int Unusual);

    public string? SkipReason { get; }
    public Dictionary<string, int> SelfTest { get; } = new();
    public Dictionary<string, long> Allocated { get; } = new();
    public Dictionary<string, List<Row>> Rows { get; } = new();
    public Dictionary<string, string> Sources { get; } = new();

    public static readonly NumericMode[] Modes = [NumericMode.F32, NumericMode.F64];

    public CSharpBuildFixture()
    {
        var dotnet = Toolchain.Find("dotnet");
        if (dotnet is null) { SkipReason = "dotnet is not on PATH"; return; }
        var dir = Toolchain.TempDir("csharp");
        var program = new StringBuilder();
        program.Append("""
            using System;
            using System.Globalization;
            using System.IO;

            internal static class Program
            {
                private static byte[] Units(string bits)
                {
                    var u = new byte[bits.Length];
                    for (int i = 0; i < bits.Length; i++) u[i] = bits[i] == '1' ? (byte)(1 + i % 200) : (byte)0;
                    return u;
                }

                private static byte[] Pack(byte[] units)
                {
                    var p = new byte[(units.Length + 7) / 8];
                    for (int i = 0; i < units.Length; i++) if (units[i] != 0) p[i >> 3] |= (byte)(1 << (i & 7));
                    if (units.Length % 8 != 0) p[p.Length - 1] |= (byte)(0xFF << (units.Length % 8));
                    return p;
                }

                public static void Main(string[] args)
                {
                    foreach (var line in File.ReadAllLines(args[0]))
                    {
                        var parts = line.Split(' ');
                        string name = parts[0];
                        if (parts[1] == "selftest")
                        {
                            Console.WriteLine(name + " selftest " + SelfTest(name));
                            continue;
                        }
                        if (parts[1] == "alloc")
                        {
                            // bytes allocated by 20 calls of each entry point and the self-test, after a warm-up
                            var u = Units(parts[2]);
                            var p = Pack(u);
                            double sink = 0;
                            for (int k = 0; k < 200; k++) sink += Touch(name, u, p);
                            long before = GC.GetAllocatedBytesForCurrentThread();
                            for (int k = 0; k < 20; k++) sink += Touch(name, u, p);
                            long after = GC.GetAllocatedBytesForCurrentThread();
                            Console.WriteLine(name + " alloc " + (after - before) + " " + (sink == 0 ? 0 : 1));
                            continue;
                        }
                        var units = Units(parts[1]);
                        var packed = Pack(units);
                        Console.WriteLine(name + " " + Score(name, units, packed));
                    }
                }

            """);
        var selfTest = new StringBuilder("    private static int SelfTest(string name) => name switch\n    {\n");
        var touch = new StringBuilder("    private static double Touch(string name, byte[] units, byte[] packed) => name switch\n    {\n");
        var score = new StringBuilder("    private static string Score(string name, byte[] units, byte[] packed)\n    {\n        switch (name)\n        {\n");
        var input = new StringBuilder();
        foreach (var c in CodegenCases.All)
            foreach (var mode in Modes)
            {
                var name = CodegenCases.Generate(c, mode, dir, "csharp");
                Sources[name] = File.ReadAllText(Path.Combine(dir, name + ".cs"));
                var cls = "Emit.Tests.Generated." + Naming.ClassName(name, Emit.Emission.Dialects.CSharpDialect.ClassMembers);
                selfTest.Append($"        \"{name}\" => {cls}.SelfTest(),\n");
                touch.Append($"        \"{name}\" => {cls}.FreeEnergy(packed) + {cls}.FreeEnergyUnits(units) + {cls}.SelfTest(),\n");
                string unusual = c.Model.Threshold.HasValue ? $"({cls}.IsUnusual(e1) ? 1 : 0)" : "-1";
                score.Append($"            case \"{name}\":\n            {{\n                var e1 = {cls}.FreeEnergy(packed);\n" +
                             $"                var e2 = {cls}.FreeEnergyUnits(units);\n" +
                             $"                return ((double)e1).ToString(\"R\", CultureInfo.InvariantCulture) + \" \" + (e1.Equals(e2) ? 1 : 0) + \" \" + {unusual};\n            }}\n");
                input.Append(name).Append(" selftest\n");
                foreach (var v in CodegenCases.Vectors(c)) input.Append(name).Append(' ').Append(CodegenCases.Bits(v)).Append('\n');
                input.Append(name).Append(" alloc ").Append(CodegenCases.Bits(CodegenCases.Vectors(c)[^1])).Append('\n');
            }
        selfTest.Append("        _ => throw new ArgumentException(name),\n    };\n");
        touch.Append("        _ => throw new ArgumentException(name),\n    };\n");
        score.Append("            default: throw new ArgumentException(name);\n        }\n    }\n");
        program.Append(selfTest).Append('\n').Append(touch).Append('\n').Append(score).Append("}\n");
        File.WriteAllText(Path.Combine(dir, "input.txt"), input.ToString());

        // the library's temporary-project builder, with warnings as errors and C# 12 (the language version of net8.0)
        var dll = CSharpProject.Build(dir, [new("Program.cs", program.ToString())],
            new CSharpProject.Settings("net10.0", "12", WarningsAsErrors: true), Toolchain.Limit, out var failure);
        Assert.True(dll is not null, $"generated C# did not build:\n{failure}");
        var run = Toolchain.RunOk(dotnet, [dll!, Path.Combine(dir, "input.txt")], dir);
        foreach (var line in run.Split('\n', StringSplitOptions.RemoveEmptyEntries))
        {
            var p = line.Split(' ');
            if (p[1] == "selftest") { SelfTest[p[0]] = int.Parse(p[2], CultureInfo.InvariantCulture); continue; }
            if (p[1] == "alloc") { Allocated[p[0]] = long.Parse(p[2], CultureInfo.InvariantCulture); continue; }
            if (!Rows.TryGetValue(p[0], out var list)) Rows[p[0]] = list = [];
            list.Add(new Row(double.Parse(p[1], CultureInfo.InvariantCulture), p[2] == "1", int.Parse(p[3], CultureInfo.InvariantCulture)));
        }
    }
}

public sealed class GeneratedCSharpTests(CSharpBuildFixture fixture) : IClassFixture<CSharpBuildFixture>
{
    public static TheoryData<string, NumericMode> Cases() => GeneratedCTests.Cases();

    [SkippableTheory]
    [MemberData(nameof(Cases))]
    public void Generated_csharp_matches_the_reference_scorer_and_passes_its_self_test(string id, NumericMode mode)
    {
        Skip.If(fixture.SkipReason is not null, fixture.SkipReason);
        var c = CodegenCases.All.Single(x => x.Id == id);
        var name = c.Id + "_" + mode.ToText();
        Assert.Equal(0, fixture.SelfTest[name]);
        Assert.Equal(0, fixture.Allocated[name]);   // no allocation per call
        var vectors = CodegenCases.Vectors(c);
        var rows = fixture.Rows[name];
        Assert.Equal(vectors.Count, rows.Count);
        var reference = new ReferenceScorer(c.Model);
        double rel = GeneratedCTests.RelativeTolerance(mode);
        double threshold = c.Model.Threshold is { } t ? Literals.Round(t, mode, "threshold") : 0;
        for (int k = 0; k < vectors.Count; k++)
        {
            double expected = reference.FreeEnergy(vectors[k]);
            double error = Math.Abs(rows[k].Energy - expected);
            Assert.True(error <= rel * Math.Max(1.0, Math.Abs(expected)), $"{name} vector {k}: generated {rows[k].Energy:R}, reference {expected:R}");
            double bound = FloatErrorBound.ForVector(c.Model, mode, vectors[k]) + FloatErrorBound.Reference(c.Model, vectors[k]);
            Assert.True(error <= bound, $"{name} vector {k}: error {error:R} is above the stated bound {bound:R}");
            Assert.True(rows[k].SameBits, $"{name} vector {k}: FreeEnergy and FreeEnergyUnits differ");
            if (c.Model.Threshold.HasValue) Assert.Equal(rows[k].Energy > threshold ? 1 : 0, rows[k].Unusual);
        }
    }

    [SkippableFact]
    public void Generated_csharp_has_the_contracted_shape()
    {
        Skip.If(fixture.SkipReason is not null, fixture.SkipReason);
        var src = fixture.Sources["rbm_a_f32"];
        Assert.StartsWith("// <auto-generated/>\n", src);
        Assert.Contains("public static class RbmAF32", src);
        Assert.Matches(@"public const int Visible = 37;", src);
        Assert.Matches(@"public const int Hidden = 11;", src);
        Assert.Matches(@"public const double EnergyScale = 1\.0;", src);
        Assert.Matches(@"public static float FreeEnergy\(global::System\.ReadOnlySpan<byte> packed\)", src);
        Assert.Matches(@"public static float FreeEnergyUnits\(global::System\.ReadOnlySpan<byte> units\)", src);
        Assert.Matches(@"public static bool IsUnusual\(float f\)", src);
        Assert.Matches(@"public static int SelfTest\(\)", src);
        Assert.DoesNotMatch(@"\busing\s+(?!System)", src);     // BCL only
        Assert.DoesNotMatch(@"new\s+(float|double|byte|int)\s*\[\s*\w*\s*\]\s*[^{\s]", src); // no per-call arrays
        Assert.DoesNotContain("public static bool IsUnusual", fixture.Sources["rbm_b_f32"]); // no threshold, no IsUnusual
        Assert.Matches(@"public static double FreeEnergy\(", fixture.Sources["rbm_a_f64"]);
    }
}
