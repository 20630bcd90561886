using Emit.Emission;

namespace Emit.Tests.Emission;

/// <summary>
/// Issue 3 §5: the generated C# compiles warning-free on net8.0 (the oldest supported target, C# 12) with nullable
/// enabled. The reference assemblies come from NuGet's Microsoft.NETCore.App.Ref 8.0 package.
/// </summary>
public sealed class GeneratedCSharpNet8Tests
{
    [SkippableFact]
    public void Every_case_and_mode_builds_on_net8_with_warnings_as_errors()
    {
        var dotnet = Toolchain.Require("dotnet");
        var dir = Toolchain.TempDir("net8");
        File.WriteAllText(Path.Combine(dir, "Net8Check.csproj"), """
            <Project Sdk="Microsoft.NET.Sdk">
              <PropertyGroup>
                <TargetFramework>net8.0</TargetFramework>
                <Nullable>enable</Nullable>
                <TreatWarningsAsErrors>true</TreatWarningsAsErrors>
                <AnalysisLevel>latest</AnalysisLevel>
                <ImplicitUsings>disable</ImplicitUsings>
              </PropertyGroup>
            </Project>
            """);
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
                CodegenCases.Generate(c, mode, dir, "csharp");
        var (exit, output, err) = Toolchain.Run(dotnet, ["build", "-nologo", "-v", "q", "-c", "Release"], dir);
        Assert.True(exit == 0, output + err);
        Assert.Contains(" 0 Warning(s)", output);
        Assert.DoesNotContain("warning CS", output + err);
    }
}
