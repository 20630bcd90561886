using System.Diagnostics;
using System.Text;

namespace Emit.Harness;

/// <summary>Runs external programs (compilers, dotnet, qemu) with captured output and an outer time limit.</summary>
public static class ExternalProcess
{
    /// <summary>
    /// Start information with redirected streams, arguments passed one by one (no shell), and quiet dotnet.
    /// </summary>
    public static ProcessStartInfo StartInfo(string program, IEnumerable<string> args, string? workDir,
        bool redirectInput)
    {
        var psi = new ProcessStartInfo(program)
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            RedirectStandardInput = redirectInput,
            UseShellExecute = false,
            WorkingDirectory = workDir ?? Environment.CurrentDirectory,
            StandardOutputEncoding = Encoding.UTF8,
            StandardErrorEncoding = Encoding.UTF8,
        };
        foreach (var a in args) psi.ArgumentList.Add(a);
        psi.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        psi.Environment["DOTNET_NOLOGO"] = "1";
        psi.Environment["DOTNET_SKIP_FIRST_TIME_EXPERIENCE"] = "1";
        return psi;
    }

    /// <summary>
    /// Runs <paramref name="program"/> to completion, feeding <paramref name="stdin"/> when given. A program still
    /// running after <paramref name="timeout"/> is killed with its children and reported as timed out.
    /// </summary>
    public static ProcessResult Run(string program, IEnumerable<string> args, TimeSpan timeout, string? workDir = null,
        string? stdin = null)
    {
        var watch = Stopwatch.StartNew();
        using var p = new Process { StartInfo = StartInfo(program, args, workDir, stdin is not null) };
        try
        {
            p.Start();
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            throw new EmitException($"cannot start {program}: {e.Message}",
                "check that the program exists and is executable");
        }
        var stdoutTask = p.StandardOutput.ReadToEndAsync();
        var stderrTask = p.StandardError.ReadToEndAsync();
        if (stdin is not null)
        {
            try
            {
                p.StandardInput.Write(stdin);
                p.StandardInput.Close();
            }
            catch (IOException)
            {
                // the program exited without reading all of its input; its exit code tells the rest
            }
        }
        bool timedOut = !p.WaitForExit(timeout);
        if (timedOut) Kill(p);
        p.WaitForExit();
        return new ProcessResult(timedOut ? -1 : p.ExitCode, stdoutTask.Result, stderrTask.Result, timedOut,
            watch.Elapsed.TotalSeconds);
    }

    /// <summary>Kills a process and its children, ignoring one that has already exited.</summary>
    public static void Kill(Process p)
    {
        try
        {
            if (!p.HasExited) p.Kill(entireProcessTree: true);
        }
        catch (InvalidOperationException)
        {
        }
        catch (System.ComponentModel.Win32Exception)
        {
        }
    }
}
