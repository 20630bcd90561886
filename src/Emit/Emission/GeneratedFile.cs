namespace Emit.Emission;

/// <summary>
/// One generated source file: its name (no folder), its text (LF line ends) and the templates it was laid out from
/// (the main template first, then those it included, in the order they were first read).
/// </summary>
public sealed record GeneratedFile(string FileName, string Text, IReadOnlyList<UsedTemplate> Templates)
{
    /// <summary>A file made without templates.</summary>
    public GeneratedFile(string fileName, string text) : this(fileName, text, [])
    {
    }
}
