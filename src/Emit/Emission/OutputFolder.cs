using System.Text;

namespace Emit.Emission;

/// <summary>
/// Writes generated files into folders through <see cref="AtomicFile.WriteAll"/>: all to temporary names first, then
/// renamed into place; none at all when any would replace a file emit did not write (unless forced).
/// </summary>
public static class OutputFolder
{
    private static readonly UTF8Encoding Utf8NoBom = new(false);

    /// <summary>Writes <paramref name="files"/> into <paramref name="folder"/>; returns the paths written.</summary>
    public static IReadOnlyList<string> Write(string folder, IReadOnlyList<GeneratedFile> files, bool force) =>
        WriteAll([(folder, files)], force);

    /// <summary>
    /// Writes a compiled scorer's sources and its manifest (<c>NAME.emit.json</c>) as one step; returns the paths
    /// written.
    /// </summary>
    public static IReadOnlyList<string> Write(string folder, CompiledScorer compiled, bool force) =>
        WriteAll([(folder, compiled.AllFiles)], force);

    /// <summary>Writes several folders' files as one step; returns the paths written.</summary>
    public static IReadOnlyList<string> WriteAll(
        IReadOnlyList<(string Folder, IReadOnlyList<GeneratedFile> Files)> groups, bool force) =>
        AtomicFile.WriteAll(
            groups.SelectMany(
                g => g.Files.Select(f => (Path.Combine(g.Folder, f.FileName), Utf8NoBom.GetBytes(f.Text)))).ToArray(),
            force);
}
