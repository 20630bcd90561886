using System.Diagnostics;
using System.Text;

namespace Emit.Harness;

/// <summary>
/// A harness program that reads packed inputs as hex lines on standard input and writes one result line each (the
/// host C and .NET targets). A batch is written by a second thread while results are read, followed by a "." line
/// that makes the program flush, so neither side waits on a full pipe; every batch has the outer time limit.
/// </summary>
internal sealed class ProcessSession : IScorerSession
{
    private const int MaxErrorChars = 8000;

    private readonly Process _process;
    private readonly HarnessLayout _layout;
    private readonly TimeSpan _timeout;
    private readonly string _what;
    private readonly StringBuilder _stderr = new();
    private bool _broken;

    private ProcessSession(Process process, HarnessLayout layout, TimeSpan timeout, string what)
    {
        _process = process;
        _layout = layout;
        _timeout = timeout;
        _what = what;
        _process.ErrorDataReceived += (_, e) =>
        {
            if (e.Data is null) return;
            lock (_stderr)
                if (_stderr.Length < MaxErrorChars) _stderr.Append(e.Data).Append('\n');
        };
    }

    public int? SelfTestFailures { get; private set; }

    /// <summary>
    /// Starts <paramref name="program"/> and reads its first line; null with a reason when it does not start as a
    /// harness.
    /// </summary>
    public static ProcessSession? Start(string program, IEnumerable<string> args, string workDir, HarnessLayout layout,
        TimeSpan timeout, string what, out string failure)
    {
        var p = new Process { StartInfo = ExternalProcess.StartInfo(program, args, workDir, redirectInput: true) };
        try
        {
            p.Start();
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            p.Dispose();
            failure = $"cannot start {what}: {e.Message}";
            return null;
        }
        p.StandardInput.AutoFlush = false;
        p.BeginErrorReadLine();
        var session = new ProcessSession(p, layout, timeout, what);
        var header = session.ReadLine(Stopwatch.StartNew(), out var timedOut);
        int? selfTest = null;
        failure = "";
        if (timedOut)
        {
            ExternalProcess.Kill(p);
            failure = $"{what} did not answer within {timeout.TotalSeconds:F0} s (stopped before its first line; the " +
                "self-test or the scorer hangs)";
        }
        else if (header is null) failure = session.Ended("before its first line");
        else selfTest = layout.ReadHeader(header, out failure);
        if (selfTest is null)
        {
            session.Dispose();
            return null;
        }
        session.SelfTestFailures = selfTest;
        return session;
    }

    public bool TryScore(ReadOnlySpan<byte> packed, int rows, Span<ScoredRow> results, out string failure)
    {
        failure = "";
        if (_broken)
        {
            failure = $"{_what} has already failed";
            return false;
        }
        var text = new StringBuilder(rows * (2 * _layout.PackedBytes + 1) + 2);
        for (int r = 0; r < rows; r++)
        {
            foreach (var b in packed.Slice(r * _layout.PackedBytes, _layout.PackedBytes))
                text.Append(HexDigits[b >> 4]).Append(HexDigits[b & 15]);
            text.Append('\n');
        }
        text.Append(".\n");
        var input = _process.StandardInput;
        var write = Task.Run(() =>
        {
            try
            {
                input.Write(text.ToString());
                input.Flush();
            }
            catch (IOException)
            {
                // the program ended early; reading its output reports why
            }
        });
        var watch = Stopwatch.StartNew();
        for (int r = 0; r < rows; r++)
        {
            var line = ReadLine(watch, out bool timedOut);
            if (timedOut)
            {
                _broken = true;
                ExternalProcess.Kill(_process);
                failure = $"{_what} did not answer within {_timeout.TotalSeconds:F0} s (stopped after {r} of {rows} " +
                    "inputs of this batch)";
                return false;
            }
            if (line is null)
            {
                _broken = true;
                failure = Ended($"after {r} of {rows} inputs of this batch");
                return false;
            }
            if (!_layout.TryParseRow(line, out results[r]))
            {
                _broken = true;
                ExternalProcess.Kill(_process);
                failure = $"{_what} wrote an unexpected line: \"{HarnessLayout.Shorten(line)}\"";
                return false;
            }
        }
        write.Wait(_timeout);
        return true;
    }

    private static readonly char[] HexDigits = "0123456789abcdef".ToCharArray();

    private string? ReadLine(Stopwatch watch, out bool timedOut)
    {
        var remaining = _timeout - watch.Elapsed;
        var task = _process.StandardOutput.ReadLineAsync();
        timedOut = remaining <= TimeSpan.Zero || !task.Wait(remaining);
        return timedOut ? null : task.Result;
    }

    /// <summary>Why the program's output ended early: its exit status and the end of its standard error.</summary>
    private string Ended(string when)
    {
        if (!_process.WaitForExit(TimeSpan.FromSeconds(10))) ExternalProcess.Kill(_process);
        _process.WaitForExit();
        string err;
        lock (_stderr) err = _stderr.ToString().Trim();
        var status = _process.ExitCode;
        var what = status >= 128 ? $"was killed by signal {status - 128}" : status < 0
            ? $"was killed by signal {-status}" : $"exited with status {status}";
        var reason = $"{_what} {what} {when}";
        if (err.Length > 0) reason += ": " + string.Join(" | ", err.Split('\n').Take(8));
        return reason;
    }

    public void Dispose()
    {
        try
        {
            if (_broken) ExternalProcess.Kill(_process);
            if (!_process.HasExited)
            {
                try { _process.StandardInput.Close(); } catch (IOException) { }
                if (!_process.WaitForExit(TimeSpan.FromSeconds(10))) ExternalProcess.Kill(_process);
            }
        }
        catch (InvalidOperationException)
        {
        }
        _process.Dispose();
    }
}
