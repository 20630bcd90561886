using Emit.Harness;

namespace Emit.Tests.Emission;

/// <summary>
/// Test-side access to external tools. Finding and running programs is the library's (<see cref="Tool"/>,
/// <see cref="ExternalProcess"/>, <see cref="CFlags"/>); this adds what only tests need: skipping a test when a tool is
/// missing (failing it under CI=true) and temporary folders.
/// </summary>
internal static class Toolchain
{
    /// <summary>The strict flags every C compile in the tests uses.</summary>
    public const string StrictC = CFlags.Strict;

    /// <summary>The same for a C++17 compile of the generated C.</summary>
    public const string StrictCpp = CFlags.StrictCpp;

    /// <summary>Time limit of every external program run by a test.</summary>
    public static readonly TimeSpan Limit = TimeSpan.FromMinutes(10);

    public static bool InCi => string.Equals(Environment.GetEnvironmentVariable("CI"), "true", StringComparison.OrdinalIgnoreCase);

    /// <summary>Full path of a program on PATH, or null.</summary>
    public static string? Find(string program) => Tool.Find(program);

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

    /// <summary>Skips the test (fails it under CI=true) unless <paramref name="check"/> passes; it throws the library's message naming the package.</summary>
    public static void RequireTools(Action check)
    {
        try
        {
            check();
        }
        catch (EmitException e)
        {
            Assert.False(InCi, $"required under CI=true (.ci/run installs it): {e.OneLine()}");
            Skip.If(true, e.OneLine());
        }
    }

    /// <summary>Runs a program to completion; returns exit code and captured output.</summary>
    public static (int Exit, string Out, string Err) Run(string program, IEnumerable<string> args, string? workDir = null, string? stdin = null)
    {
        var r = ExternalProcess.Run(program, args, Limit, workDir, stdin);
        if (r.TimedOut) throw new TimeoutException($"{program} did not finish in {Limit.TotalSeconds} s");
        return (r.ExitCode, r.Out, r.Err);
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

    public static IEnumerable<string> Split(string flags) => CFlags.Split(flags);
}
