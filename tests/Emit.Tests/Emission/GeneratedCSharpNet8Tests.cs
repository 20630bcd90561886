using Emit.Emission;
using Emit.Quantize;
using Emit.Harness;

namespace Emit.Tests.Emission;

/// <summary>
/// the generated C# compiles warning-free on net8.0 (the oldest supported target, C# 12) with nullable
/// enabled. The reference assemblies come from NuGet's Microsoft.NETCore.App.Ref 8.0 package.
/// </summary>
public sealed class GeneratedCSharpNet8Tests
{
    [SkippableFact]
    public void Every_case_and_mode_builds_on_net8_with_warnings_as_errors()
    {
        Toolchain.Require("dotnet");
        var dir = Toolchain.TempDir("net8");
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64 })
                CodegenCases.Generate(c, mode, dir, "csharp");
        // the library's temporary-project builder: warnings as errors, latest analyzers, as a class library
        var dll = CSharpProject.Build(dir, [], new CSharpProject.Settings("net8.0", WarningsAsErrors: true, Library: true), Toolchain.Limit, out var failure);
        Assert.True(dll is not null, failure);
    }
}
