namespace Emit.Cli;

/// <summary>What commands read from and write to; tests pass their own. <paramref name="In"/> null means the console's standard input.</summary>
public sealed record CliContext(TextWriter Out, TextWriter Error, Stream? In = null);
