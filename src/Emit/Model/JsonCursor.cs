using System.Diagnostics.CodeAnalysis;
using System.Text.Json;

namespace Emit.Model;

/// <summary>
/// A forward-only walk over a JSON file's tokens for emit's readers (model files, project files): every error is an
/// <see cref="EmitException"/> naming the file, line and column of the offending token, never the JSON library's own
/// exception. Comments are skipped; trailing commas are refused; the nesting depth is capped.
/// </summary>
public ref struct JsonCursor
{
    private readonly ReadOnlySpan<byte> _bytes;
    private readonly string _source;
    private readonly string _whole;

    /// <summary>The underlying reader, for token values the helpers below do not cover.</summary>
    [SuppressMessage("Design", "CA1051", Justification = "a mutable struct: a property would hand out copies")]
    public Utf8JsonReader R;

    /// <param name="utf8">The file's bytes (a leading byte-order mark must already be removed).</param>
    /// <param name="source">The file name used in errors.</param>
    /// <param name="whole">What the file holds, one word for messages ("model": "file ends before the model is
    /// complete").</param>
    public JsonCursor(ReadOnlySpan<byte> utf8, string source, string whole)
    {
        _bytes = utf8;
        _source = source;
        _whole = whole;
        R = new Utf8JsonReader(utf8, new JsonReaderOptions
        {
            CommentHandling = JsonCommentHandling.Skip,
            MaxDepth = 64,
        });
    }

    /// <summary>The file name used in errors.</summary>
    public readonly string Source => _source;

    /// <summary>The bytes being read.</summary>
    public readonly ReadOnlySpan<byte> Bytes => _bytes;

    /// <summary>
    /// The bytes of a file of at most <paramref name="maxBytes"/>, refused before reading when larger.
    /// </summary>
    public static byte[] ReadFile(string path, long maxBytes, string what)
    {
        try
        {
            var info = new FileInfo(path);
            if (!info.Exists) throw new EmitException("file not found", "check the path", path);
            if (Directory.Exists(path)) throw new EmitException("is a folder, not a file", "name a file", path);
            // The length is trusted only to refuse early: a device (/dev/zero, /dev/urandom) or a FIFO reports 0 and
            // may never end, so bytes are counted while reading and the cap applies to what was actually read.
            if (info.Length > maxBytes)
                throw new EmitException($"file is {info.Length} bytes, more than {what} may be ({maxBytes})", null,
                    path);
            using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, bufferSize: 1);
            return ReadCapped(stream, maxBytes, what, path);
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
    }

    /// <summary>
    /// Reads <paramref name="stream"/> to its end, refusing it once more than <paramref name="maxBytes"/> bytes have
    /// arrived. When the first non-blank byte (after an optional byte-order mark) is not '{', reading stops there and
    /// the bytes so far are returned, for the parser to report at line 1; likewise at the first NUL byte. An endless
    /// binary source (/dev/zero, /dev/urandom) is so refused at its first chunk instead of after the cap.
    /// </summary>
    public static byte[] ReadCapped(Stream stream, long maxBytes, string what, string source)
    {
        var buffer = new byte[(int)Math.Min(maxBytes + 1, 1 << 16)];
        long total = 0;
        bool sniffed = false;
        while (true)
        {
            if (total == buffer.Length)
            {
                long grown = Math.Min(Math.Min(maxBytes + 1, Array.MaxLength), Math.Max(total * 2, 1 << 16));
                if (total > maxBytes || grown == total)
                    throw new EmitException(
                        $"file is more than {Math.Min(maxBytes, total)} bytes, more than {what} may be", null, source);
                Array.Resize(ref buffer, (int)grown);
            }
            int got = stream.Read(buffer, (int)total, buffer.Length - (int)total);
            if (got == 0) break;
            total += got;
            // No JSON text holds a raw NUL (RFC 8259 §7: control characters appear only escaped, and outside strings
            // only blanks are allowed): binary data is refused by the parser at or before it, so stop reading here.
            if (buffer.AsSpan((int)total - got, got).Contains((byte)0)) break;
            if (!sniffed && OpensObject(buffer.AsSpan(0, (int)total)) is { } opens)
            {
                if (!opens) break;
                sniffed = true;
            }
        }
        if (total > maxBytes)
            throw new EmitException($"file is more than {maxBytes} bytes, more than {what} may be", null, source);
        return buffer.AsSpan(0, (int)total).ToArray();
    }

    /// <summary>
    /// Whether the first non-blank byte is '{', or null while only a byte-order mark and blanks have arrived.
    /// </summary>
    private static bool? OpensObject(ReadOnlySpan<byte> start)
    {
        if (start.Length < 3 && "\uFEFF"u8.StartsWith(start)) return null;
        var rest = (start.StartsWith("\uFEFF"u8) ? start[3..] : start).TrimStart(" \t\r\n"u8);
        return rest.IsEmpty ? null : rest[0] == (byte)'{';
    }

    /// <summary>Strips a UTF-8 byte-order mark; refuses an empty or blank file.</summary>
    public static ReadOnlySpan<byte> Content(ReadOnlySpan<byte> utf8, string source, string expected)
    {
        if (utf8.StartsWith("\uFEFF"u8)) utf8 = utf8[3..];
        if (utf8.IsEmpty || utf8.Trim(" \t\r\n"u8).IsEmpty)
            throw new EmitException("file is empty", "expected " + expected, source);
        return utf8;
    }

    /// <summary>An error at the current token.</summary>
    public readonly EmitException Error(string problem, string? hint = null) => Error(problem, hint, R.TokenStartIndex);

    /// <summary>An error at byte <paramref name="offset"/>, given as line and column.</summary>
    public readonly EmitException Error(string problem, string? hint, long offset)
    {
        var (line, column) = Position(offset);
        return new EmitException(problem, hint, _source, line, column);
    }

    /// <summary>Line and column (both from 1) of byte <paramref name="offset"/>.</summary>
    public readonly (long Line, long Column) Position(long offset)
    {
        long line = 1, lastNl = -1;
        long end = Math.Min(offset, _bytes.Length);
        for (int k = 0; k < end; k++)
            if (_bytes[k] == (byte)'\n') { line++; lastNl = k; }
        return (line, offset - lastNl);
    }

    /// <summary>The JSON library's syntax error as emit's error.</summary>
    public readonly EmitException SyntaxError(JsonException e, string? hint = null) =>
        new($"not valid JSON: {FirstSentence(e.Message)}", hint, _source, (e.LineNumber ?? 0) + 1,
            (e.BytePositionInLine ?? 0) + 1);

    private static string FirstSentence(string message)
    {
        int k = message.IndexOf(" LineNumber", StringComparison.Ordinal);
        return (k > 0 ? message[..k] : message).TrimEnd('.', ' ');
    }

    /// <summary>Moves to the next token; the end of the file here is an error.</summary>
    public void Read()
    {
        try
        {
            if (!R.Read())
                throw Error($"file ends before the {_whole} is complete", "the file may be truncated", _bytes.Length);
        }
        catch (JsonException e)
        {
            throw SyntaxError(e, $"the file may be truncated or not a {_whole} file");
        }
    }

    /// <summary>Skips the current value (an object or array with everything inside it).</summary>
    /// <summary>
    /// Skips the object or array the reader is at, refusing a field named twice in any object at any depth
    /// (RFC 8259 §4: names "SHOULD be unique", and readers disagree on which duplicate wins).
    /// <paramref name="within"/> names the value in that message.
    /// </summary>
    public void Skip(string within)
    {
        var stack = new Stack<HashSet<string>?>();
        try
        {
            do
            {
                switch (R.TokenType)
                {
                    case JsonTokenType.StartObject: stack.Push(new HashSet<string>(StringComparer.Ordinal)); break;
                    case JsonTokenType.StartArray: stack.Push(null); break;
                    case JsonTokenType.EndObject or JsonTokenType.EndArray: stack.Pop(); break;
                    case JsonTokenType.PropertyName:
                        var key = Text();
                        if (!stack.Peek()!.Add(key)) throw Error($"field \"{key}\" appears twice in {within}");
                        break;
                }
            }
            while (stack.Count > 0 && R.Read());
        }
        catch (JsonException e) { throw SyntaxError(e); }
    }

    /// <summary>Refuses anything but whitespace and comments after the top-level value.</summary>
    public void ExpectEnd()
    {
        try
        {
            if (R.Read()) throw Error($"text after the end of the {_whole} object");
        }
        catch (JsonException e) { throw SyntaxError(e); }
    }

    /// <summary>
    /// Moves to the next field of the current object and returns false at its end; a field named twice is refused
    /// (<paramref name="within"/> names the object in that message, or null for the top level).
    /// </summary>
    public bool NextField(HashSet<string> seen, string? within, out string key)
    {
        Read();
        key = "";
        if (R.TokenType == JsonTokenType.EndObject) return false;
        Expect(JsonTokenType.PropertyName, "a field name");
        key = Text();
        if (!seen.Add(key)) throw Error($"field \"{key}\" appears twice" + (within is null ? "" : " in " + within));
        return true;
    }

    /// <summary>Reads the value of a <c>format</c> field, which must be <paramref name="expected"/>.</summary>
    public void Format(string expected, string hint)
    {
        var format = String("format");
        if (format != expected) throw Error($"format \"{format}\" is not \"{expected}\"", hint);
    }

    /// <summary>Reads the value of a <c>version</c> field, which must be <paramref name="supported"/>.</summary>
    public int Version(int supported)
    {
        Read();
        Expect(JsonTokenType.Number, "a version number");
        if (!R.TryGetInt32(out int version) || version != supported)
            throw Error($"version {System.Text.Encoding.UTF8.GetString(R.ValueSpan)} is not supported",
                $"this emit reads version {supported}");
        return version;
    }

    /// <summary>
    /// Throws a positioned error unless the current token is <paramref name="type"/>; <paramref name="what"/> names
    /// what was expected.
    /// </summary>
    public readonly void Expect(JsonTokenType type, string what)
    {
        if (R.TokenType != type) throw Error($"expected {what}, found {Describe(R.TokenType)}");
    }

    /// <summary>A token type in words, for error messages.</summary>
    public static string Describe(JsonTokenType t) => t switch
    {
        JsonTokenType.StartObject => "an object",
        JsonTokenType.StartArray => "an array",
        JsonTokenType.String => "a string",
        JsonTokenType.Number => "a number",
        JsonTokenType.True or JsonTokenType.False => "true/false",
        JsonTokenType.Null => "null",
        JsonTokenType.EndArray => "the end of an array",
        JsonTokenType.EndObject => "the end of an object",
        JsonTokenType.PropertyName => "a field name",
        _ => t.ToString(),
    };

    /// <summary>The current string token; invalid UTF-8 inside it is emit's error, not the JSON reader's.</summary>
    public readonly string Text()
    {
        try { return R.GetString()!; }
        catch (InvalidOperationException) { throw Error("text is not valid UTF-8", "save the file as UTF-8"); }
    }

    /// <summary>Reads a string value for <paramref name="field"/>.</summary>
    public string String(string field)
    {
        Read();
        Expect(JsonTokenType.String, $"a string for {field}");
        return Text();
    }

    /// <summary>Reads <c>true</c> or <c>false</c> for <paramref name="field"/>.</summary>
    public bool Boolean(string field)
    {
        Read();
        return R.TokenType switch
        {
            JsonTokenType.True => true,
            JsonTokenType.False => false,
            _ => throw Error($"expected true or false for {field}, found {Describe(R.TokenType)}"),
        };
    }

    /// <summary>Reads a finite number for <paramref name="field"/>.</summary>
    public double Number(string field)
    {
        Read();
        Expect(JsonTokenType.Number, $"a number for {field}");
        if (!R.TryGetDouble(out double d) || !double.IsFinite(d))
            throw Error($"{field} is not a finite number", "every number must be finite");
        return d;
    }

    /// <summary>
    /// Reads a whole number in [<paramref name="min"/>, <paramref name="max"/>] for <paramref name="field"/>.
    /// </summary>
    public int Integer(string field, int min, int max)
    {
        Read();
        Expect(JsonTokenType.Number, $"an integer for {field}");
        if (!R.TryGetInt64(out long v))
            throw Error($"{field} must be a whole number");
        if (v < min || v > max)
            throw Error($"{field} = {v} is out of range", $"use {min} to {max}");
        return (int)v;
    }
}
