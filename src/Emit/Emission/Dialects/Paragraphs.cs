namespace Emit.Emission.Dialects;

/// <summary>
/// Fills comment paragraphs to a width (generated comments are prose built in C#; templates print them).
/// </summary>
public static class Paragraphs
{
    /// <summary>
    /// Paragraphs filled to <paramref name="width"/> characters, broken at spaces; the continuation lines of a
    /// paragraph that starts indented keep its indent plus two spaces.
    /// </summary>
    public static IEnumerable<string> Wrap(IEnumerable<string> paragraphs, int width)
    {
        foreach (var line in paragraphs)
        {
            var rest = line;
            var indent = new string(' ', line.Length - line.TrimStart(' ').Length);
            while (rest.Length > width)
            {
                int cut = rest.LastIndexOf(' ', width);
                if (cut <= indent.Length) break;
                yield return rest[..cut];
                rest = (indent.Length > 0 ? indent + "  " : "") + rest[(cut + 1)..];
            }
            yield return rest;
        }
    }
}
