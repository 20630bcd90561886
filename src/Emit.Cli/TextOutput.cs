using System.Text;

namespace Emit.Cli;

/// <summary>
/// Where a command's text result goes: standard output (no file, or <c>-</c>), or a file written atomically (UTF-8,
/// "\n" line ends) under the no-clobber rule (docs/cli.md, "Files emit writes").
/// </summary>
public static class TextOutput
{
    /// <summary>True when <paramref name="path"/> means standard output.</summary>
    public static bool IsStdout(string? path) => path is null or "-";

    public static void Write(string? path, bool force, TextWriter stdout, Action<TextWriter> body)
    {
        if (IsStdout(path))
        {
            body(stdout);
            stdout.Flush();
            return;
        }
        AtomicFile.Write(Path.GetFullPath(path!), force, stream =>
        {
            using var w = new StreamWriter(stream, new UTF8Encoding(false), 1 << 16) { NewLine = "\n" };
            body(w);
        });
    }
}
