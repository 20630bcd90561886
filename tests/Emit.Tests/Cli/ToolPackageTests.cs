using System.Diagnostics;
using System.IO.Compression;
using System.Runtime.CompilerServices;
using System.Xml.Linq;

namespace Emit.Tests.Cli;

/// <summary>
/// <c>dotnet pack src/Emit.Cli</c> makes a .NET tool package whose command is <c>emit</c> (README, "Install"). The
/// layout checked is the one the .NET SDK documents for tool packages: <c>tools/TFM/any/DotnetToolSettings.xml</c>
/// naming the command and entry point, and a nuspec with package type DotnetTool. Packs the existing Release build
/// when there is one (seconds), else builds it.
/// </summary>
public sealed class ToolPackageTests
{
    [Fact]
    public async Task Pack_makes_a_dotnet_tool_whose_command_is_emit()
    {
        var project = Path.Combine(RepoRoot(), "src", "Emit.Cli");
        var output = CliRunner.TempDir();
        bool built = File.Exists(Path.Combine(project, "bin", "Release", "net10.0", "emit.dll"));
        var psi = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { "pack", project, "-c", "Release", "-o", output, "-nologo" }) psi.ArgumentList.Add(a);
        if (built) psi.ArgumentList.Add("--no-build");
        using var p = Process.Start(psi)!;
        var log = p.StandardOutput.ReadToEndAsync();
        var err = p.StandardError.ReadToEndAsync();
        using (var timeout = new CancellationTokenSource(TimeSpan.FromMinutes(5)))
            await p.WaitForExitAsync(timeout.Token);
        Assert.True(p.ExitCode == 0, await log + await err);

        var package = Assert.Single(Directory.GetFiles(output, "*.nupkg"));
        using var zip = ZipFile.OpenRead(package);
        var settings = zip.Entries.Single(e => e.FullName.EndsWith("/DotnetToolSettings.xml", StringComparison.Ordinal));
        Assert.StartsWith("tools/net10.0/any/", settings.FullName);
        XDocument xml;
        using (var s = settings.Open()) xml = XDocument.Load(s);
        var command = xml.Descendants("Command").Single();
        Assert.Equal("emit", command.Attribute("Name")!.Value);
        Assert.Equal("emit.dll", command.Attribute("EntryPoint")!.Value);
        Assert.Contains(zip.Entries, e => e.FullName == "tools/net10.0/any/emit.dll");
        Assert.Contains(zip.Entries, e => e.FullName == "tools/net10.0/any/demo-data/reefer-fleet.json");

        var nuspec = zip.Entries.Single(e => e.FullName.EndsWith(".nuspec", StringComparison.Ordinal));
        using var ns = nuspec.Open();
        var spec = XDocument.Load(ns);
        Assert.Equal("emit-scorer-compiler", spec.Descendants().Single(e => e.Name.LocalName == "id").Value);
        Assert.Contains(spec.Descendants().Where(e => e.Name.LocalName == "packageType"), e => e.Attribute("name")?.Value == "DotnetTool");
    }

    private static string RepoRoot([CallerFilePath] string here = "") =>
        Path.GetFullPath(Path.Combine(Path.GetDirectoryName(here)!, "..", "..", ".."));
}
