using System.Diagnostics;
using System.Text;

namespace Emit.Tests.Emission;

/// <summary>Runs external tools (C compiler, dotnet, python3) for compile-and-run tests.</summary>
internal static class Toolchain
{
    /// <summary>The strict flags every C compile in the tests uses (issue 3 §3).</summary>
    public const string StrictC = "-std=c99 -Wall -Wextra -Wpedantic -Wconversion -Wshadow -Wstrict-prototypes -Werror";

    /// <summary>The same for a C++17 compile of the generated C (-Wstrict-prototypes is C only).</summary>
    public const string StrictCpp = "-std=c++17 -x c++ -Wall -Wextra -Wpedantic -Wconversion -Wshadow -Werror";

    public static bool InCi => string.Equals(Environment.GetEnvironmentVariable("CI"), "true", StringComparison.OrdinalIgnoreCase);

    /// <summary>Full path of a program on PATH, or null.</summary>
    public static string? Find(string program)
    {
        foreach (var dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator))
        {
            if (dir.Length == 0) continue;
            var path = Path.Combine(dir, program);
            if (File.Exists(path)) return path;
        }
        return null;
    }

    /// <summary>The path of <paramref name="program"/>; skips the test when missing, fails it under CI=true.</summary>
    public static string Require(string program)
    {
        var path = Find(program);
        if (path is null)
        {
            Assert.False(InCi, $"{program} is required under CI=true (.ci/run installs it)");
            Skip.If(true, $"{program} is not installed");
        }
        return path!;
    }

    /// <summary>Runs a program to completion; returns exit code and captured output.</summary>
    public static (int Exit, string Out, string Err) Run(string program, IEnumerable<string> args, string? workDir = null, string? stdin = null, int timeoutSeconds = 600)
    {
        var psi = new ProcessStartInfo(program)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            RedirectStandardInput = stdin is not null,
            UseShellExecute = false,
            WorkingDirectory = workDir ?? Environment.CurrentDirectory,
            StandardOutputEncoding = Encoding.UTF8,
        };
        foreach (var a in args) psi.ArgumentList.Add(a);
        psi.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        psi.Environment["DOTNET_NOLOGO"] = "1";
        using var p = Process.Start(psi)!;
        var stdoutTask = p.StandardOutput.ReadToEndAsync();
        var stderrTask = p.StandardError.ReadToEndAsync();
        if (stdin is not null)
        {
            p.StandardInput.Write(stdin);
            p.StandardInput.Close();
        }
        if (!p.WaitForExit(timeoutSeconds * 1000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"{program} did not finish in {timeoutSeconds} s");
        }
        return (p.ExitCode, stdoutTask.Result, stderrTask.Result);
    }

    /// <summary>Runs and asserts exit code 0, showing the output otherwise.</summary>
    public static string RunOk(string program, IEnumerable<string> args, string? workDir = null, string? stdin = null)
    {
        var list = args.ToList();
        var (exit, output, err) = Run(program, list, workDir, stdin);
        Assert.True(exit == 0, $"{program} {string.Join(' ', list)} exited {exit}\n{output}\n{err}");
        return output;
    }

    private static readonly List<string> Created = [];

    /// <summary>A fresh temporary folder, deleted when the test process exits (kept when EMIT_KEEP_TEMP=1, for debugging).</summary>
    public static string TempDir(string what)
    {
        var dir = Path.Combine(Path.GetTempPath(), "emit-tests", what + "-" + Guid.NewGuid().ToString("N")[..8]);
        Directory.CreateDirectory(dir);
        lock (Created)
        {
            if (Created.Count == 0 && Environment.GetEnvironmentVariable("EMIT_KEEP_TEMP") != "1")
                AppDomain.CurrentDomain.ProcessExit += (_, _) =>
                {
                    lock (Created)
                        foreach (var d in Created)
                            try { Directory.Delete(d, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
                };
            Created.Add(dir);
        }
        return dir;
    }

    public static IEnumerable<string> Split(string flags) => flags.Split(' ', StringSplitOptions.RemoveEmptyEntries);
}
