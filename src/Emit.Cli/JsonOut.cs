using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;

namespace Emit.Cli;

/// <summary>Writes indented JSON to a text writer (invariant, round-trip numbers, "\n" line ends).</summary>
public static class JsonOut
{
    public static void Write(TextWriter output, Action<Utf8JsonWriter> body)
    {
        using var ms = new MemoryStream();
        using (var w = new Utf8JsonWriter(ms,
            new JsonWriterOptions { Indented = true, Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
                NewLine = "\n" }))
            body(w);
        output.WriteLine(Encoding.UTF8.GetString(ms.ToArray()));
    }
}
