using System.Text;

namespace Emit.Vectors;

/// <summary>
/// Writes vectors in the format <see cref="VectorReader"/> reads: comma-separated 0/1, "\n" line ends, and a header
/// of unit names when every name can be written on one line (names with a comma, quote or surrounding space are
/// double-quoted, a quote doubled).
/// </summary>
public sealed class VectorWriter
{
    private readonly TextWriter _w;
    private readonly StringBuilder _line = new();

    /// <summary>
    /// A writer to <paramref name="writer"/>, with a header row of <paramref name="names"/> when given.
    /// </summary>
    public VectorWriter(TextWriter writer, IReadOnlyList<string>? names)
    {
        _w = writer;
        if (names is { Count: > 0 } && names.All(n => n.Length > 0 && !n.Contains('\n') && !n.Contains('\r')))
            _w.Write(string.Join(",", names.Select(Quote)) + "\n");
    }

    private static string Quote(string name) =>
        name.IndexOfAny([',', '"', ' ', '\t']) >= 0 ? "\"" + name.Replace("\"", "\"\"") + "\"" : name;

    /// <summary>Writes one vector (one byte per unit, 0 or 1) as a row.</summary>
    public void Write(ReadOnlySpan<byte> units)
    {
        _line.Clear();
        for (int i = 0; i < units.Length; i++)
        {
            if (i > 0) _line.Append(',');
            _line.Append(units[i] != 0 ? '1' : '0');
        }
        _w.Write(_line.Append('\n'));
    }
}
