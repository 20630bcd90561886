using System.Globalization;
using System.Security;

namespace Emit.Harness;

/// <summary>
/// A temporary console project around generated C#, built with <c>dotnet build</c>. The folder gets empty
/// Directory.Build.props/.targets so no settings of an enclosing folder leak in, and build servers are disabled so no
/// process outlives the build.
/// </summary>
public static class CSharpProject
{
    /// <summary>Project settings.</summary>
    /// <param name="TargetFramework">e.g. net10.0; null: the major version of the installed SDK.</param>
    /// <param name="LangVersion">C# language version, or null for the framework's default.</param>
    /// <param name="WarningsAsErrors">Treat every warning (level 9999, .NET analyzers at the latest analysis level) as
    /// an error.</param>
    /// <param name="Library">Build a class library instead of a console program.</param>
    public sealed record Settings(string? TargetFramework = null, string? LangVersion = null,
        bool WarningsAsErrors = false, bool Library = false);

    /// <summary>Assembly name of the temporary harness project.</summary>
    public const string AssemblyName = "EmitHarness";

    private static readonly Tool Dotnet = new("dotnet", "dotnet-sdk-10.0", ".NET SDK");

    /// <summary>The dotnet program; throws naming the package when missing.</summary>
    public static string RequireDotnet(string target) => Dotnet.Require(target);

    /// <summary>
    /// net{major}.0 for the installed SDK (from <c>dotnet --version</c>), net10.0 when that cannot be read.
    /// </summary>
    public static string DefaultFramework(string dotnet, TimeSpan timeout)
    {
        var r = ExternalProcess.Run(dotnet, ["--version"], timeout);
        var text = r.Out.Trim();
        int dot = text.IndexOf('.', StringComparison.Ordinal);
        return r.Ok && dot > 0
            && int.TryParse(text[..dot], NumberStyles.None, CultureInfo.InvariantCulture, out int major) && major >= 8
            ? $"net{major}.0"
            : "net10.0";
    }

    /// <summary>
    /// Writes the project and <paramref name="sources"/> (file name → text) into <paramref name="directory"/> and
    /// builds it. Returns the path of the built assembly, or null with the build's messages in
    /// <paramref name="failure"/>.
    /// </summary>
    public static string? Build(string directory, IEnumerable<KeyValuePair<string, string>> sources, Settings settings,
        TimeSpan timeout, out string failure)
    {
        var dotnet = RequireDotnet("csharp");
        Directory.CreateDirectory(directory);
        var framework = settings.TargetFramework ?? DefaultFramework(dotnet, timeout);
        string strict = settings.WarningsAsErrors
            ? """

                  <TreatWarningsAsErrors>true</TreatWarningsAsErrors>
                  <WarningLevel>9999</WarningLevel>
                  <EnableNETAnalyzers>true</EnableNETAnalyzers>
                  <AnalysisLevel>latest</AnalysisLevel>
              """
            : "";
        string lang = settings.LangVersion is null ? ""
            : $"\n    <LangVersion>{SecurityElement.Escape(settings.LangVersion)}</LangVersion>";
        File.WriteAllText(Path.Combine(directory, AssemblyName + ".csproj"), $"""
            <Project Sdk="Microsoft.NET.Sdk">
              <PropertyGroup>
                <OutputType>{(settings.Library ? "Library" : "Exe")}</OutputType>
                <TargetFramework>{SecurityElement.Escape(framework)}</TargetFramework>
                <AssemblyName>{AssemblyName}</AssemblyName>{lang}
                <Nullable>enable</Nullable>
                <ImplicitUsings>disable</ImplicitUsings>
                <InvariantGlobalization>true</InvariantGlobalization>
                <GenerateDocumentationFile>false</GenerateDocumentationFile>{strict}
              </PropertyGroup>
            </Project>
            """);
        File.WriteAllText(Path.Combine(directory, "Directory.Build.props"), "<Project />\n");
        File.WriteAllText(Path.Combine(directory, "Directory.Build.targets"), "<Project />\n");
        foreach (var (name, text) in sources)
            File.WriteAllText(Path.Combine(directory, name), text);
        var bin = Path.Combine(directory, "bin");
        var result = ExternalProcess.Run(dotnet,
            ["build", "-c", "Release", "-nologo", "-v", "q", "--disable-build-servers", "-o", bin], timeout, directory);
        if (!result.Ok)
        {
            failure = result.TimedOut
                ? $"dotnet build did not finish within {timeout.TotalSeconds:F0} s"
                : "the generated C# does not build:\n" + result.Tail();
            return null;
        }
        failure = "";
        return Path.Combine(bin, AssemblyName + ".dll");
    }
}
