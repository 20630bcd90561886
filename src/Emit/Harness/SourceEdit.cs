namespace Emit.Harness;

/// <summary>
/// A generated file that is not what emit generates: its name, the first differing line (from 1; null when it is
/// unknown because the sources' model is not at hand), the line emit generates there and the line found (null past
/// the end of a file), and whether its SHA-256 still matches the manifest's (then emit's output changed, not the file).
/// </summary>
public sealed record SourceEdit(string File, int? Line, string? Expected, string? Found, bool MatchesManifest);
