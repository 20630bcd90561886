namespace Emit.Harness;

/// <summary>How an external program ended: exit code, captured output, and whether the time limit stopped it.</summary>
public sealed record ProcessResult(int ExitCode, string Out, string Err, bool TimedOut, double Seconds)
{
    /// <summary>True when the program exited by itself with code 0.</summary>
    public bool Ok => !TimedOut && ExitCode == 0;

    /// <summary>The last lines of standard error and output, for a one-paragraph failure reason.</summary>
    public string Tail(int maxLines = 12)
    {
        var lines = (Err + "\n" + Out).Split('\n',
            StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
        return string.Join("\n", lines.Take(maxLines));
    }
}
