namespace Emit.Emission;

/// <summary>One generated source file: its name (no folder) and its text (LF line ends).</summary>
public sealed record GeneratedFile(string FileName, string Text);
