using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Quantize;

namespace Emit.Tests.Emission;

/// <summary>
/// cppcheck's MISRA C:2012 addon (Debian cppcheck) over the generated C of every case and numeric mode;
/// the guidelines it reports must be exactly those docs/misra.md lists as deviations, so the document stays true.
/// </summary>
public sealed class MisraTests
{
    private static HashSet<string> DocumentedRules()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (!File.Exists(Path.Combine(dir.FullName, "docs", "misra.md"))) dir = dir.Parent!;
        return Regex.Matches(File.ReadAllText(Path.Combine(dir.FullName, "docs", "misra.md")), @"^\| (\d+\.\d+) \|", RegexOptions.Multiline)
            .Select(m => m.Groups[1].Value).ToHashSet();
    }

    [SkippableFact]
    public void Reported_guidelines_are_all_documented()
    {
        var cppcheck = Toolchain.Require("cppcheck");
        var documented = DocumentedRules();
        Assert.Contains("8.9", documented);
        var dir = Toolchain.TempDir("misra");
        var sources = new List<string>();
        foreach (var c in CodegenCases.All)
            foreach (var mode in new[] { NumericMode.F32, NumericMode.F64, NumericMode.Fixed })
                sources.Add(Path.Combine(dir, CodegenCases.Generate(c, mode, dir) + ".c"));
        // float.h's macros are given as on every IEEE 754 target, since cppcheck does not read system headers here.
        var (_, output, err) = Toolchain.Run(cppcheck,
            ["-q", "--addon=misra", "--std=c99", "-DFLT_RADIX=2", "-DFLT_MANT_DIG=24", "-DDBL_MANT_DIG=53", "-I", dir, .. sources]);
        var reported = Regex.Matches(output + err, @"misra-c2012-(\d+\.\d+)").Select(m => m.Groups[1].Value).ToHashSet();
        Assert.NotEmpty(reported); // the addon ran (several advisory deviations are intended)
        var undocumented = reported.Except(documented).Order().ToList();
        Assert.True(undocumented.Count == 0, "not in docs/misra.md: " + string.Join(", ", undocumented));
        var stale = documented.Except(reported).Order().ToList();
        Assert.True(stale.Count == 0, "listed in docs/misra.md but no longer reported: " + string.Join(", ", stale));
        Assert.DoesNotContain("noValidConfiguration", output + err);
    }
}
