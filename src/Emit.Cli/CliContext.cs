namespace Emit.Cli;

/// <summary>
/// What commands read from and write to; tests pass their own. <paramref name="In"/> null means the console's standard
/// input. <paramref name="ErrorIsConsole"/>: <paramref name="Error"/> is the console's standard error (behind the
/// terminal filter), so a progress display may draw there.
/// </summary>
public sealed record CliContext(TextWriter Out, TextWriter Error, Stream? In = null, bool ErrorIsConsole = false);
