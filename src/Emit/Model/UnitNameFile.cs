using System.Collections.Immutable;
using System.Text;
using Emit.Vectors;

namespace Emit.Model;

/// <summary>
/// Unit names for a model that has none (<c>emit import --names FILE</c>): either a CSV whose header row names the
/// units, in column order (a vector file, docs/vector-files.md: the header is read as <see cref="VectorReader"/>
/// reads it), or a text file with one name per line. A first line with a comma or a tab is a CSV header; otherwise the
/// file is one name per line (blank lines at the end ignored, spaces around a name trimmed).
/// </summary>
public static class UnitNameFile
{
    /// <summary>Largest names file read (one name per line).</summary>
    public const int MaxBytes = 16 << 20;

    /// <summary>Reads <paramref name="visible"/> names from <paramref name="path"/>; errors carry FILE:LINE.</summary>
    public static ImmutableArray<string> Read(string path, int visible)
    {
        if (Directory.Exists(path)) throw new EmitException("is a folder, not a file of unit names", null, path);
        if (!File.Exists(path)) throw new EmitException("file not found", "check the path", path);
        string first;
        try
        {
            using var r = new StreamReader(path, Encoding.UTF8, detectEncodingFromByteOrderMarks: true);
            first = ReadFirstLine(r);
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        return first.Contains(',') || first.Contains('\t') ? FromHeader(path, visible) : OnePerLine(path, visible);
    }

    private static string ReadFirstLine(StreamReader r)
    {
        var sb = new StringBuilder();
        int c;
        while ((c = r.Read()) >= 0 && c != '\n' && sb.Length < MaxBytes) sb.Append((char)c);
        return sb.ToString();
    }

    private static ImmutableArray<string> FromHeader(string path, int visible)
    {
        using var reader = VectorReader.Open(path, visible);
        if (reader.Names.IsEmpty)
            throw new EmitException("the first row holds 0/1 values, not unit names",
                "give a CSV whose first row names the units, or one name per line", path, 1);
        return reader.Names;
    }

    private static ImmutableArray<string> OnePerLine(string path, int visible)
    {
        if (new FileInfo(path).Length > MaxBytes)
            throw new EmitException($"is larger than the {MaxBytes} bytes allowed for a file of unit names", null,
                path);
        var lines = File.ReadAllText(path, Encoding.UTF8).Split('\n').Select(l => l.TrimEnd('\r').Trim()).ToList();
        while (lines.Count > 0 && lines[^1].Length == 0) lines.RemoveAt(lines.Count - 1);
        for (int k = 0; k < lines.Count; k++)
            if (lines[k].Length == 0)
                throw new EmitException("a name is empty", "write one name per line, without blank lines between them",
                    path, k + 1);
        if (lines.Count != visible)
            throw new EmitException($"has {lines.Count} names, expected {visible}",
                "give one name per visible unit of the model, in unit order", path,
                Math.Min(lines.Count, visible) + 1);
        var seen = new Dictionary<string, int>(StringComparer.Ordinal);
        for (int k = 0; k < lines.Count; k++)
            if (!seen.TryAdd(lines[k], k))
                throw new EmitException($"the name on this line repeats line {seen[lines[k]] + 1}",
                    "give every unit its own name", path, k + 1);
        return [.. lines];
    }
}
