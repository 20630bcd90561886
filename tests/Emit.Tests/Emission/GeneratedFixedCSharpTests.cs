using System.Globalization;
using System.Text;
using Emit.Emission;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Tests.Emission;

/// <summary>
/// Builds the generated fixed-point C# of every combination (<see cref="FixedCodegenCases"/>) in ONE temporary project
/// with nullable enabled, warnings as errors and C# 12, once with overflow checking on (so an overflow the range
/// analysis missed would throw), and runs it over the combinations' inputs.
/// </summary>
public sealed class FixedCSharpBuildFixture
{
    public string? SkipReason { get; }
    public Dictionary<string, int> SelfTest { get; } = new();
    public Dictionary<string, long> Allocated { get; } = new();
    public Dictionary<string, List<(long Energy, bool Same, int Unusual)>> Rows { get; } = new();
    public Dictionary<string, string> Sources { get; } = new();

    public FixedCSharpBuildFixture()
    {
        var dotnet = Toolchain.Find("dotnet");
        if (dotnet is null) { SkipReason = "dotnet is not on PATH"; return; }
        var dir = Toolchain.TempDir("csharp-fixed");
        File.WriteAllText(Path.Combine(dir, "Harness.csproj"), """
            <Project Sdk="Microsoft.NET.Sdk">
              <PropertyGroup>
                <OutputType>Exe</OutputType>
                <TargetFramework>net10.0</TargetFramework>
                <LangVersion>12</LangVersion>
                <Nullable>enable</Nullable>
                <ImplicitUsings>disable</ImplicitUsings>
                <TreatWarningsAsErrors>true</TreatWarningsAsErrors>
                <WarningLevel>9999</WarningLevel>
                <EnableNETAnalyzers>true</EnableNETAnalyzers>
                <InvariantGlobalization>true</InvariantGlobalization>
                <CheckForOverflowUnderflow>true</CheckForOverflowUnderflow>
              </PropertyGroup>
            </Project>
            """);
        var program = new StringBuilder("""
            using System;
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
                    if (units.Length % 8 != 0) p[p.Length - 1] |= (byte)((0xFF << (units.Length % 8)) & 0xFF);
                    return p;
                }

                public static void Main(string[] args)
                {
                    foreach (var line in File.ReadAllLines(args[0]))
                    {
                        var parts = line.Split(' ');
                        string name = parts[0];
                        if (parts[1] == "selftest") { Console.WriteLine(name + " selftest " + SelfTest(name)); continue; }
                        var u = Units(parts[2]);
                        var p = Pack(u);
                        if (parts[1] == "alloc")
                        {
                            long sink = 0;
                            for (int k = 0; k < 200; k++) sink += Touch(name, u, p);
                            long before = GC.GetAllocatedBytesForCurrentThread();
                            for (int k = 0; k < 20; k++) sink += Touch(name, u, p);
                            long after = GC.GetAllocatedBytesForCurrentThread();
                            Console.WriteLine(name + " alloc " + (after - before) + " " + (sink == 0 ? 0 : 1));
                            continue;
                        }
                        Console.WriteLine(name + " " + Score(name, u, p));
                    }
                }

            """);
        var selfTest = new StringBuilder("    private static int SelfTest(string name) => name switch\n    {\n");
        var touch = new StringBuilder("    private static long Touch(string name, byte[] units, byte[] packed) => name switch\n    {\n");
        var score = new StringBuilder("    private static string Score(string name, byte[] units, byte[] packed)\n    {\n        switch (name)\n        {\n");
        var input = new StringBuilder();
        foreach (var c in FixedCodegenCases.All)
        {
            var name = FixedCodegenCases.Generate(c, dir, "csharp");
            Sources[name] = File.ReadAllText(Path.Combine(dir, name + ".cs"));
            var cls = "Emit.Tests.Generated." + Naming.ClassName(name, Emit.Emission.Dialects.CSharpDialect.ClassMembers);
            selfTest.Append($"        \"{name}\" => {cls}.SelfTest(),\n");
            touch.Append($"        \"{name}\" => (long){cls}.FreeEnergy(packed) + {cls}.FreeEnergyUnits(units) + {cls}.SelfTest(),\n");
            string unusual = c.Case.Model.Threshold.HasValue ? $"({cls}.IsUnusual(e1) ? 1 : 0)" : "-1";
            score.Append($"            case \"{name}\":\n            {{\n                var e1 = {cls}.FreeEnergy(packed);\n" +
                         $"                var e2 = {cls}.FreeEnergyUnits(units);\n" +
                         $"                return e1 + \" \" + (e1 == e2 ? 1 : 0) + \" \" + {unusual};\n            }}\n");
            input.Append(name).Append(" selftest\n");
            foreach (var v in FixedCodegenCases.Vectors(c)) input.Append(name).Append(" score ").Append(CodegenCases.Bits(v)).Append('\n');
            input.Append(name).Append(" alloc ").Append(CodegenCases.Bits(CodegenCases.Vectors(c.Case)[^1])).Append('\n');
        }
        selfTest.Append("        _ => throw new ArgumentException(name),\n    };\n");
        touch.Append("        _ => throw new ArgumentException(name),\n    };\n");
        score.Append("            default: throw new ArgumentException(name);\n        }\n    }\n");
        program.Append(selfTest).Append('\n').Append(touch).Append('\n').Append(score).Append("}\n");
        File.WriteAllText(Path.Combine(dir, "Program.cs"), program.ToString());
        File.WriteAllText(Path.Combine(dir, "input.txt"), input.ToString());

        var (exit, output, err) = Toolchain.Run(dotnet, ["build", "-c", "Release", "-nologo", "-v", "q", "-o", Path.Combine(dir, "bin")], dir);
        Assert.True(exit == 0, $"generated C# did not build:\n{output}\n{err}");
        var run = Toolchain.RunOk(dotnet, [Path.Combine(dir, "bin", "Harness.dll"), Path.Combine(dir, "input.txt")], dir);
        foreach (var line in run.Split('\n', StringSplitOptions.RemoveEmptyEntries))
        {
            var p = line.Split(' ');
            if (p[1] == "selftest") { SelfTest[p[0]] = int.Parse(p[2], CultureInfo.InvariantCulture); continue; }
            if (p[1] == "alloc") { Allocated[p[0]] = long.Parse(p[2], CultureInfo.InvariantCulture); continue; }
            if (!Rows.TryGetValue(p[0], out var list)) Rows[p[0]] = list = [];
            list.Add((long.Parse(p[1], CultureInfo.InvariantCulture), p[2] == "1", int.Parse(p[3], CultureInfo.InvariantCulture)));
        }
    }
}

public sealed class GeneratedFixedCSharpTests(FixedCSharpBuildFixture fixture) : IClassFixture<FixedCSharpBuildFixture>
{
    public static TheoryData<string> Combos() => FixedCodegenCases.Names();

    [SkippableTheory]
    [MemberData(nameof(Combos))]
    public void Generated_csharp_gives_the_simulators_integers_and_stays_within_the_bound(string combo)
    {
        Skip.If(fixture.SkipReason is not null, fixture.SkipReason);
        var c = FixedCodegenCases.Find(combo);
        var plan = FixedCodegenCases.Plan(c);
        Assert.Equal(0, fixture.SelfTest[combo]);
        Assert.Equal(0, fixture.Allocated[combo]);   // no allocation per call (issue 3 §5)
        var vectors = FixedCodegenCases.Vectors(c);
        var rows = fixture.Rows[combo];
        Assert.Equal(vectors.Count, rows.Count);
        var sim = new FixedPointSimulator(plan);
        var reference = new ReferenceScorer(c.Case.Model);
        var scorer = FixedScorerPlan.Build(c.Case.Model, FixedCodegenCases.Options(c, "csharp"), "x.json", plan);
        for (int k = 0; k < vectors.Count; k++)
        {
            long expected = sim.FreeEnergy(vectors[k]);
            Assert.True(expected == rows[k].Energy, $"{combo} vector {k}: generated {rows[k].Energy}, simulator {expected}");
            Assert.True(rows[k].Same, $"{combo} vector {k}: FreeEnergy and FreeEnergyUnits differ");
            double error = Math.Abs(rows[k].Energy / plan.EnergyScale - reference.FreeEnergy(vectors[k]));
            Assert.True(error <= plan.ErrorBound, $"{combo} vector {k}: error {error:R} above the bound {plan.ErrorBound:R}");
            if (scorer.ThresholdUnits is { } t) Assert.Equal(rows[k].Energy > t ? 1 : 0, rows[k].Unusual);
        }
    }

    [SkippableFact]
    public void Generated_fixed_csharp_has_the_contracted_shape()
    {
        Skip.If(fixture.SkipReason is not null, fixture.SkipReason);
        var src = fixture.Sources["rbm_a_int16_int32"];
        Assert.StartsWith("// <auto-generated/>\n", src);
        Assert.Matches(@"public const double EnergyScale = \d+\.0;", src);
        Assert.Matches(@"public const int EnergyFractionBits = \d+;", src);
        Assert.Matches(@"public const double ErrorBound = \d\.\d+(e-\d+)?;", src);
        Assert.Matches(@"public const int Threshold = -?\d+;", src);
        Assert.Matches(@"public static int FreeEnergy\(global::System\.ReadOnlySpan<byte> packed\)", src);
        Assert.Matches(@"public static bool IsUnusual\(int f\)", src);
        Assert.Matches(@"public static long FreeEnergy\(", fixture.Sources["rbm_a_int16_int64"]);
        Assert.Matches(@"ReadOnlySpan<sbyte> WeightTable", fixture.Sources["rbm_a_int8_int32"]);
        Assert.DoesNotMatch(@"\b(float|double|decimal)\b", src.Replace("const double EnergyScale", "", StringComparison.Ordinal).Replace("const double ErrorBound", "", StringComparison.Ordinal));
        Assert.DoesNotContain("Math", src);
    }
}
