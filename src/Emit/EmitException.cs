namespace Emit;

/// <summary>
/// The one error type of the library: a problem with the user's input or environment, with the place it
/// was found (file, line, column when known) and what to do about it. The CLI prints it as one line
/// (<c>emit: error: FILE:LINE: what is wrong (what to do)</c>) and exits with code 2.
/// </summary>
public sealed class EmitException : Exception
{
    public EmitException(string problem, string? hint = null, string? file = null, long? line = null, long? column = null, Exception? inner = null)
        : base(problem, inner)
    {
        Problem = problem;
        Hint = hint;
        File = file;
        Line = line;
        Column = column;
    }

    /// <summary>What is wrong, without location or hint.</summary>
    public string Problem { get; }

    /// <summary>What the user can do about it, or null.</summary>
    public string? Hint { get; }

    public string? File { get; }
    public long? Line { get; }
    public long? Column { get; }

    /// <summary>A copy of this error that names <paramref name="file"/> when it did not name a file yet.</summary>
    public EmitException InFile(string file) =>
        File is null ? new EmitException(Problem, Hint, file, Line, Column, InnerException) : this;

    /// <summary>The one-line form: <c>FILE:LINE:COL: problem (hint)</c>.</summary>
    public string OneLine()
    {
        var where = File ?? "";
        if (Line is not null) where += (where.Length > 0 ? ":" : "line ") + Line;
        if (Line is not null && Column is not null) where += ":" + Column;
        var text = where.Length > 0 ? where + ": " + Problem : Problem;
        if (!string.IsNullOrEmpty(Hint)) text += " (" + Hint + ")";
        return text.Replace('\n', ' ').Replace('\r', ' ');
    }

    public override string Message => OneLine();
}
