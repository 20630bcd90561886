namespace Emit.Cli;

/// <summary>What commands write to; tests pass their own writers.</summary>
public sealed record CliContext(TextWriter Out, TextWriter Error);
