namespace Emit;

/// <summary>
/// The one error type of the library: a problem with the user's input or environment, with the place it
/// was found (file, line, column when known) and what to do about it. The CLI prints it as one line
/// (<c>emit: error: FILE:LINE: what is wrong (what to do)</c>) and exits with code 2.
/// </summary>
public sealed class EmitException : Exception
{
    /// <summary>
    /// A user error: <paramref name="problem"/> and an optional <paramref name="hint"/>, at an optional position in a
    /// file.
    /// </summary>
    public EmitException(string problem, string? hint = null, string? file = null, long? line = null,
        long? column = null, Exception? inner = null)
        : base(problem, inner)
    {
        _problem = problem;
        _hint = hint;
        File = file;
        Line = line;
        Column = column;
    }

    private readonly string _problem;
    private readonly string? _hint;

    /// <summary>What is wrong, without location or hint; settings named by their project-file keys.</summary>
    public string Problem => Settings.Render(_problem);

    /// <summary>What the user can do about it, or null; settings named by their project-file keys.</summary>
    public string? Hint => _hint is null ? null : Settings.Render(_hint);

    /// <summary>The file the error is in, or null.</summary>
    public string? File { get; }
    /// <summary>The 1-based line in <see cref="File"/>, or null.</summary>
    public long? Line { get; }
    /// <summary>The 1-based column in <see cref="File"/>, or null.</summary>
    public long? Column { get; }

    /// <summary>A copy of this error that names <paramref name="file"/> when it did not name a file yet.</summary>
    public EmitException InFile(string file) =>
        File is null ? new EmitException(_problem, _hint, file, Line, Column, InnerException) : this;

    /// <summary>
    /// A copy of this error placed at <paramref name="line"/> and <paramref name="column"/> of <paramref name="file"/>
    /// when it had no place yet.
    /// </summary>
    public EmitException At(string file, long line, long? column) =>
        Line is null ? new EmitException(_problem, _hint, File ?? file, line, column, InnerException) : this;

    /// <summary>
    /// The one-line form: <c>FILE:LINE:COL: problem (hint)</c>, settings named by <paramref name="settingName"/>
    /// (default: their project-file keys, <see cref="Settings.Key"/>).
    /// </summary>
    public string OneLine(Func<Setting, string>? settingName = null)
    {
        var problem = Settings.Render(_problem, settingName);
        var hint = _hint is null ? null : Settings.Render(_hint, settingName);
        var where = File ?? "";
        if (Line is not null) where += (where.Length > 0 ? ":" : "line ") + Line;
        if (Line is not null && Column is not null) where += ":" + Column;
        var text = where.Length > 0 ? where + ": " + problem : problem;
        if (!string.IsNullOrEmpty(hint)) text += " (" + hint + ")";
        return text.Replace('\n', ' ').Replace('\r', ' ');
    }

    /// <summary>The one-line message, as <see cref="OneLine"/> gives it.</summary>
    public override string Message => OneLine();
}
