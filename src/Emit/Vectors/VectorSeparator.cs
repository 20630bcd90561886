namespace Emit.Vectors;

/// <summary>
/// How the values on a line of a vector file are separated; fixed by the file's first non-blank line.
/// </summary>
public enum VectorSeparator
{
    /// <summary>Commas, with optional spaces or tabs around each value.</summary>
    Comma,

    /// <summary>Runs of spaces or tabs.</summary>
    Whitespace,
}
