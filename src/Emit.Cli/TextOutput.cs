using System.Text;

namespace Emit.Cli;

/// <summary>Where a command's text result goes: standard output, or a file written atomically (UTF-8, "\n" line ends).</summary>
public static class TextOutput
{
    public static void Write(FileInfo? file, bool force, TextWriter stdout, Action<TextWriter> body)
    {
        if (file is null)
        {
            body(stdout);
            return;
        }
        AtomicFile.Write(file.FullName, force, stream =>
        {
            using var w = new StreamWriter(stream, new UTF8Encoding(false), 1 << 16) { NewLine = "\n" };
            body(w);
        });
    }
}
