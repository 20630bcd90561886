using System.Runtime.CompilerServices;

namespace Emit.Tests.Emission;

/// <summary>
/// Approved-file checks: the text must equal <c>snapshots/&lt;folder&gt;/&lt;name&gt;.verified.&lt;ext&gt;</c> next to this file.
/// On a difference a <c>.received.</c> file is written beside it for review. Set EMIT_UPDATE_SNAPSHOTS=1 to accept the
/// current output (then review the diff by eye: these files are what users read).
/// </summary>
internal static class Approved
{
    public static void Verify(string actual, string folder, string name, string ext, [CallerFilePath] string callerPath = "")
    {
        var dir = Path.Combine(Path.GetDirectoryName(callerPath)!, "snapshots", folder);
        var verified = Path.Combine(dir, $"{name}.verified.{ext}");
        var received = Path.Combine(dir, $"{name}.received.{ext}");
        if (Environment.GetEnvironmentVariable("EMIT_UPDATE_SNAPSHOTS") == "1")
        {
            Directory.CreateDirectory(dir);
            File.WriteAllText(verified, actual);
            if (File.Exists(received)) File.Delete(received);
            return;
        }
        if (!File.Exists(verified))
        {
            Directory.CreateDirectory(dir);
            File.WriteAllText(received, actual);
            Assert.Fail($"no approved file {verified}; wrote {received} (review it, then rename it or run with EMIT_UPDATE_SNAPSHOTS=1)");
        }
        var expected = File.ReadAllText(verified).Replace("\r\n", "\n", StringComparison.Ordinal);
        if (expected == actual)
        {
            if (File.Exists(received)) File.Delete(received);
            return;
        }
        File.WriteAllText(received, actual);
        var e = expected.Split('\n');
        var a = actual.Split('\n');
        int line = 0;
        while (line < Math.Min(e.Length, a.Length) && e[line] == a[line]) line++;
        Assert.Fail($"{verified} differs at line {line + 1}:\n  approved: {(line < e.Length ? e[line] : "(end)")}\n  received: {(line < a.Length ? a[line] : "(end)")}\nwrote {received}");
    }
}
