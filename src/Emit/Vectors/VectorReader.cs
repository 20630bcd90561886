using System.Buffers;
using System.Collections.Immutable;
using System.Text;

namespace Emit.Vectors;

/// <summary>
/// Streams binary vectors from a text file, one vector per line, in constant memory whatever the number of lines.
/// <para>File format:</para>
/// <list type="bullet">
/// <item>Each value is <c>0</c> or <c>1</c>. Values are separated by commas (spaces or tabs around them are allowed)
/// or by spaces/tabs; the first non-blank line decides which, for the whole file.</item>
/// <item>An optional first line of unit names (a header) is recognised because none of its fields looks like a value
/// (a number or true/false once blanks are stripped; see docs/vector-files.md). Names may
/// be double-quoted (<c>"door, rear"</c>, with <c>""</c> for a quote), must not be empty, and must number one per
/// value. A first line of numbers only is a header just when it is the column numbers 0..n-1 or 1..n; otherwise it
/// is read as data, so a mistyped first vector is reported rather than taken for names.</item>
/// <item>Lines end with LF or CRLF; a UTF-8 byte-order mark at the start is skipped; leading and trailing spaces
/// and tabs are ignored; blank lines (empty or only spaces/tabs) are skipped anywhere and do not count as
/// vectors, but do count in the line numbers of errors.</item>
/// <item>A header with no vectors after it is an error, as an empty file is.</item>
/// <item>A line ending in a comma, an empty value (<c>0,,1</c>), a value other than 0 or 1, or the wrong number of
/// values is an <see cref="EmitException"/> naming the file, line and column (columns count characters from 1).</item>
/// <item>The path <c>-</c> reads standard input.</item>
/// </list>
/// Read row by row with <see cref="TryRead"/> or in batches with <see cref="ReadBatch(Span{byte}, int)"/>; each
/// unit becomes one byte, 0 or 1.
/// </summary>
public sealed class VectorReader : IDisposable
{
    /// <summary>The bytes of a decimal number: digits, point, exponent and signs.</summary>
    private static readonly SearchValues<byte> NumberBytes = SearchValues.Create("0123456789.eE+-"u8);
    private static readonly SearchValues<char> NumberChars = SearchValues.Create("0123456789.eE+-");
    private static readonly SearchValues<char> DigitChars = SearchValues.Create("0123456789");

    /// <summary>The path that means standard input.</summary>
    public const string StdinPath = "-";

    /// <summary>The name standard input has in errors.</summary>
    public const string StdinName = "stdin";

    /// <summary>Longest line accepted, in bytes; the reader's memory is bounded by this.</summary>
    public const int MaxLineBytes = 1 << 26;

    private static readonly UTF8Encoding StrictUtf8 = new(false, throwOnInvalidBytes: true);

    private readonly Stream _stream;
    private readonly bool _leaveOpen;
    private readonly string _widthReason;
    private readonly int _maxLineBytes;
    private byte[] _buffer = new byte[1 << 16];
    private int _start, _end;
    private bool _eof, _startChecked;
    private long _line;
    private int _pendingStart = -1, _pendingLength;

    /// <summary>Opens <paramref name="path"/> (or standard input for <c>-</c>) and reads its first line.</summary>
    /// <param name="path">The file, or <c>-</c>.</param>
    /// <param name="width">Values per line (the model's visible units), or null to take it from the first line.</param>
    /// <param name="stdin">Standard input to use for <c>-</c>; the console's when null.</param>
    public static VectorReader Open(string path, int? width = null, Stream? stdin = null)
    {
        if (path == StdinPath)
            return new VectorReader(stdin ?? Console.OpenStandardInput(), StdinName, width,
                leaveOpen: stdin is not null);
        Stream stream;
        try
        {
            if (Directory.Exists(path)) throw new EmitException("is a folder, not a vector file", null, path);
            if (!File.Exists(path))
                throw new EmitException("file not found", "check the path, or use - for standard input", path);
            stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, bufferSize: 1,
                FileOptions.SequentialScan);
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        try
        {
            return new VectorReader(stream, path, width);
        }
        catch
        {
            stream.Dispose();
            throw;
        }
    }

    /// <summary>Reads vectors from <paramref name="stream"/>; <paramref name="source"/> names it in errors.</summary>
    /// <param name="stream">UTF-8 text.</param>
    /// <param name="source">File name used in errors.</param>
    /// <param name="width">Values per line, or null to take it from the first line.</param>
    /// <param name="leaveOpen">Leave <paramref name="stream"/> open on <see cref="Dispose"/>.</param>
    public VectorReader(Stream stream, string source, int? width = null, bool leaveOpen = false)
        : this(stream, source, width, leaveOpen, MaxLineBytes)
    {
    }

    /// <summary>As the public constructor, with a smaller line limit for tests.</summary>
    internal VectorReader(Stream stream, string source, int? width, bool leaveOpen, int maxLineBytes)
    {
        _maxLineBytes = maxLineBytes;
        ArgumentNullException.ThrowIfNull(stream);
        ArgumentNullException.ThrowIfNull(source);
        if (width is < 1) throw new ArgumentOutOfRangeException(nameof(width), "width must be at least 1");
        _stream = stream;
        _leaveOpen = leaveOpen;
        Source = source;

        if (!NextLine(out int start, out int length))
            throw new EmitException("file has no vectors (it is empty)", "write one vector of 0/1 values per line",
                Source, Math.Max(_line, 1));
        var first = _buffer.AsSpan(start, length);
        Separator = first.Contains((byte)',') ? VectorSeparator.Comma : VectorSeparator.Whitespace;
        int count = 0;
        bool allBinary = true, allNumeric = true, fromZero = true, fromOne = true, anyValueLike = false;
        var fields = new VectorFields(first, Separator == VectorSeparator.Comma);
        while (fields.Next(out int s, out int e) is var kind && kind != VectorFieldKind.End)
        {
            if (kind == VectorFieldKind.Value)
            {
                var token = first[s..e];
                allBinary &= token.Length == 1 && token[0] is (byte)'0' or (byte)'1';
                allNumeric &= token.IndexOfAnyExcept(NumberBytes) < 0;
                fromZero &= IsInteger(token, count);
                fromOne &= IsInteger(token, count + 1);
                anyValueLike |= LooksLikeValue(token);
                count++;
            }
        }
        // The first line is a header only when it is the column numbers 0..n-1 or 1..n that some tools write, or
        // when none of its fields looks like a value (a number or true/false, once white space and control
        // characters of any kind are stripped). Anything else is data, so a mistyped first vector ("0,1,0\v",
        // "1,true,0") is reported with its column instead of being taken for names and silently dropped.
        bool columnNumbers = allNumeric && !allBinary && (fromZero || fromOne);
        if (!columnNumbers && (allBinary || allNumeric || anyValueLike))
        {
            _pendingStart = start;
            _pendingLength = length;
            Width = width ?? Math.Max(count, 1);
            _widthReason = width is null ? "as many as on the first line" : "one per visible unit of the model";
            Names = ImmutableArray<string>.Empty;
            return;
        }
        Names = ParseHeader(first);
        HeaderLine = _line;
        if (width is { } w && Names.Length != w)
            throw Error($"header has {Names.Length} names, expected {w}",
                "this first line was read as a header of unit names because it is not all 0/1 values; the model has " +
                w + " visible units",
                first, first.Length);
        Width = Names.Length;
        _widthReason = width is null ? "one per name in the header" : "one per visible unit of the model";
    }

    /// <summary>The file name used in errors (<c>stdin</c> for standard input).</summary>
    public string Source { get; }

    /// <summary>Values per vector.</summary>
    public int Width { get; }

    /// <summary>Unit names from the header line, or empty when the file has none.</summary>
    public ImmutableArray<string> Names { get; }

    /// <summary>Line number of the header, or 0 when the file has none.</summary>
    public long HeaderLine { get; }

    /// <summary>The separator the first line set for the file.</summary>
    public VectorSeparator Separator { get; }

    /// <summary>Vectors returned so far.</summary>
    public long RowsRead { get; private set; }

    /// <summary>Line number (from 1) of the last vector returned, or 0 before the first.</summary>
    public long LastLine { get; private set; }

    /// <summary>Reads the next vector into <paramref name="units"/> (length <see cref="Width"/>, one byte 0 or 1 per
    /// unit); false at the end of the input.</summary>
    public bool TryRead(Span<byte> units)
    {
        if (units.Length != Width) throw new ArgumentException($"need a span of {Width} bytes", nameof(units));
        int start, length;
        if (_pendingStart >= 0)
        {
            start = _pendingStart;
            length = _pendingLength;
            _pendingStart = -1;
        }
        else if (!NextLine(out start, out length))
        {
            // One rule for every command: a file of names only is as empty as an empty file.
            if (RowsRead == 0 && HeaderLine > 0)
                throw new EmitException("file has a header but no vectors",
                    "write one vector of 0/1 values per line after the header", Source, HeaderLine);
            return false;
        }
        ParseRow(_buffer.AsSpan(start, length), units);
        RowsRead++;
        LastLine = _line;
        return true;
    }

    /// <summary>Reads up to <paramref name="maxRows"/> vectors into consecutive <see cref="Width"/>-byte rows of
    /// <paramref name="buffer"/>; returns how many were read (0 at the end of the input).</summary>
    public int ReadBatch(Span<byte> buffer, int maxRows)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(maxRows);
        if ((long)maxRows * Width > buffer.Length)
            throw new ArgumentException($"need {(long)maxRows * Width} bytes for {maxRows} rows of {Width}",
                nameof(buffer));
        int rows = 0;
        while (rows < maxRows && TryRead(buffer.Slice(rows * Width, Width))) rows++;
        return rows;
    }

    /// <summary>Closes the underlying stream unless the reader was told to leave it open.</summary>
    public void Dispose()
    {
        if (!_leaveOpen) _stream.Dispose();
    }

    // ---- lines -----------------------------------------------------------------------------------------------

    /// <summary>
    /// The next non-blank line as a range of <see cref="_buffer"/> (valid until the next call), CR stripped.
    /// </summary>
    private bool NextLine(out int start, out int length)
    {
        while (true)
        {
            int searched = 0;
            int nl;
            while ((nl = _buffer.AsSpan(_start + searched, _end - _start - searched).IndexOf((byte)'\n')) < 0)
            {
                searched = _end - _start;
                if (_eof) break;
                bool startChecked = _startChecked;
                Fill();
                if (!startChecked) searched = 0;   // a byte-order mark may just have been skipped
            }
            if (_start == _end && _eof)
            {
                start = length = 0;
                return false;
            }
            _line++;
            start = _start;
            if (nl >= 0)
            {
                length = searched + nl;
                _start += length + 1;
            }
            else
            {
                length = _end - _start;
                _start = _end;
            }
            if (length > _maxLineBytes)
                throw new EmitException($"line is longer than {_maxLineBytes} bytes",
                    "is this a text file of 0/1 vectors?", Source, _line, 1);
            if (length > 0 && _buffer[start + length - 1] == (byte)'\r') length--;
            if (!IsBlank(_buffer.AsSpan(start, length))) return true;
        }
    }

    /// <summary>Reads more bytes, moving the unread part to the front and growing the buffer for long lines.</summary>
    private void Fill()
    {
        if (_start > 0)
        {
            Buffer.BlockCopy(_buffer, _start, _buffer, 0, _end - _start);
            _end -= _start;
            _start = 0;
        }
        if (_end == _buffer.Length)
        {
            if (_buffer.Length > _maxLineBytes)
                throw new EmitException($"line is longer than {_maxLineBytes} bytes",
                    "is this a text file of 0/1 vectors?", Source, _line + 1, 1);
            Array.Resize(ref _buffer, Math.Min(_buffer.Length * 2, _maxLineBytes + 2));
        }
        int n;
        try
        {
            n = _stream.Read(_buffer, _end, _buffer.Length - _end);
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, Source, _line + 1); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, Source,
            _line + 1); }
        if (n == 0) _eof = true;
        _end += n;
        if (!_startChecked && (_end >= 3 || _eof))
        {
            _startChecked = true;
            if (_buffer.AsSpan(0, _end).StartsWith("\uFEFF"u8)) _start = 3;   // UTF-8 byte-order mark
        }
    }

    private static bool IsInteger(ReadOnlySpan<byte> token, int value) =>
        System.Buffers.Text.Utf8Parser.TryParse(token, out int parsed, out int used) && used == token.Length
        && parsed == value;

    private static bool IsBlank(ReadOnlySpan<byte> line) => line.IndexOfAnyExcept((byte)' ', (byte)'\t') < 0;

    private static bool IsSpace(byte b) => VectorFields.IsSpace(b);

    // ---- rows ------------------------------------------------------------------------------------------------

    private void ParseRow(ReadOnlySpan<byte> line, Span<byte> units)
    {
        if (FastRow(line, units)) return;
        int n = 0, extraAt = -1;
        var fields = new VectorFields(line, Separator == VectorSeparator.Comma);
        while (true)
        {
            var kind = fields.Next(out int s, out int e);
            if (kind == VectorFieldKind.End) break;
            if (kind == VectorFieldKind.Empty)
                throw Error("empty value before ','", "write 0 or 1 between the commas", line, s);
            if (kind == VectorFieldKind.Trailing)
                throw Error("line ends with a separator ','", "remove the comma at the end of the line", line, s);
            if (n < Width)
            {
                if (e - s == 1 && line[s] is (byte)'0' or (byte)'1') units[n] = (byte)(line[s] - '0');
                else throw NotBinary(line, s, e);
            }
            else if (extraAt < 0)
            {
                extraAt = s;
            }
            n++;
        }
        if (n != Width)
            throw Error($"line has {n} values, expected {Width} ({_widthReason})",
                n > Width ? "remove the extra values, or check the file belongs to this model"
                : "add the missing values, or check the file belongs to this model",
                line, n > Width ? extraAt : line.Length);
    }

    /// <summary>The common layout, "0,1,0" or "0 1 0" with single separators, checked in one pass.</summary>
    private bool FastRow(ReadOnlySpan<byte> line, Span<byte> units)
    {
        if (line.Length != 2 * Width - 1) return false;
        bool comma = Separator == VectorSeparator.Comma;
        for (int k = 0; k < Width; k++)
        {
            byte v = line[2 * k];
            if (v is not ((byte)'0' or (byte)'1')) return false;
            if (k > 0)
            {
                byte sep = line[2 * k - 1];
                if (comma ? sep != (byte)',' : !IsSpace(sep)) return false;
            }
            units[k] = (byte)(v - '0');
        }
        return true;
    }

    private EmitException NotBinary(ReadOnlySpan<byte> line, int s, int e)
    {
        var token = line[s..e];
        string text = Printable(token);
        string hint;
        if (Separator == VectorSeparator.Comma && token.IndexOfAny((byte)' ', (byte)'\t') >= 0)
            hint = "values in this file are separated by commas (set by its first line); put a comma between values";
        else if (Separator == VectorSeparator.Whitespace && token.Contains((byte)','))
            hint = "values in this file are separated by spaces (set by its first line); use one separator throughout";
        else if (token.Length > 1 && token.IndexOfAnyExcept("01"u8) < 0)
            hint = "values must be separated by commas or spaces";
        else if (token.IndexOfAnyExcept(NumberBytes) < 0)
            hint = "write each value as the integer 0 or 1 (e.g. np.savetxt(f, X, fmt='%d', delimiter=','))";
        else
            hint = "each value must be 0 or 1";
        return Error($"value '{text}' is not 0 or 1", hint, line, s);
    }

    // ---- header ----------------------------------------------------------------------------------------------

    /// <summary>
    /// True when <paramref name="token"/>, stripped of white space and control or format characters (VT, NBSP,
    /// zero-width space, ...), is a number or a truth value (true/false, yes/no, in any case): something meant as a
    /// value, not a unit name.
    /// </summary>
    private static bool LooksLikeValue(ReadOnlySpan<byte> token)
    {
        var text = Encoding.UTF8.GetString(token).AsSpan();
        static bool Blank(char c) =>
            char.IsWhiteSpace(c) || char.IsControl(c)
            || char.GetUnicodeCategory(c) == System.Globalization.UnicodeCategory.Format;
        int a = 0, b = text.Length;
        while (a < b && Blank(text[a])) a++;
        while (b > a && Blank(text[b - 1])) b--;
        var core = text[a..b];
        if (core.IsEmpty) return false;
        if (core.IndexOfAnyExcept(NumberChars) < 0 && core.IndexOfAny(DigitChars) >= 0) return true;
        foreach (var word in (ReadOnlySpan<string>)["true", "false", "yes", "no"])
            if (core.Equals(word, StringComparison.OrdinalIgnoreCase)) return true;
        return false;
    }

    private ImmutableArray<string> ParseHeader(ReadOnlySpan<byte> line)
    {
        bool comma = Separator == VectorSeparator.Comma;
        var names = ImmutableArray.CreateBuilder<string>();
        int i = 0, lastComma = -1;
        while (true)
        {
            while (i < line.Length && IsSpace(line[i])) i++;
            if (i == line.Length)
            {
                if (lastComma >= 0)
                    throw Error("header ends with a separator ','", "remove the comma at the end of the line", line,
                        lastComma);
                break;
            }
            int fieldStart = i;
            string name;
            if (line[i] == (byte)'"')
            {
                var bytes = new List<byte>();
                i++;
                while (true)
                {
                    if (i == line.Length)
                        throw Error("header has a quote that is not closed", "close the name with \"", line,
                            fieldStart);
                    if (line[i] == (byte)'"')
                    {
                        if (i + 1 < line.Length && line[i + 1] == (byte)'"') { bytes.Add((byte)'"'); i += 2; continue; }
                        i++;
                        break;
                    }
                    bytes.Add(line[i++]);
                }
                while (i < line.Length && IsSpace(line[i])) i++;
                if (i < line.Length && !(comma && line[i] == (byte)',') && !(!comma && IsSpace(line[i - 1])))
                    throw Error("header has text after a quoted name", "put a separator after the closing quote", line,
                        i);
                name = Decode(bytes.ToArray(), line, fieldStart);
            }
            else
            {
                int end = i;
                while (end < line.Length && (comma ? line[end] != (byte)',' : !IsSpace(line[end]))) end++;
                int trimmed = end;
                while (trimmed > i && IsSpace(line[trimmed - 1])) trimmed--;
                if (trimmed == i)
                    throw Error($"header name {names.Count + 1} is empty",
                        "give every column a name, or remove the header line", line, i);
                name = Decode(line[i..trimmed].ToArray(), line, i);
                i = end;
            }
            if (name.Length == 0)
                throw Error($"header name {names.Count + 1} is empty",
                    "give every column a name, or remove the header line", line, fieldStart);
            names.Add(name);
            if (names.Count > Emit.Model.ModelLimits.MaxUnits)
                throw Error($"header has more than {Emit.Model.ModelLimits.MaxUnits} names", null, line, fieldStart);
            if (comma && i < line.Length && line[i] == (byte)',')
            {
                lastComma = i;
                i++;
            }
            else
            {
                lastComma = -1;
            }
        }
        return names.ToImmutable();
    }

    private string Decode(byte[] bytes, ReadOnlySpan<byte> line, int at)
    {
        try
        {
            return StrictUtf8.GetString(bytes);
        }
        catch (DecoderFallbackException)
        {
            throw Error("header is not valid UTF-8 text", "save the file as UTF-8", line, at);
        }
    }

    // ---- errors ----------------------------------------------------------------------------------------------

    /// <summary>
    /// An error at byte <paramref name="at"/> of the current line, reported as a character column from 1.
    /// </summary>
    private EmitException Error(string problem, string? hint, ReadOnlySpan<byte> line, int at)
    {
        long column = 1;
        for (int k = 0; k < at && k < line.Length; k++)
            if ((line[k] & 0xC0) != 0x80) column++;   // count UTF-8 lead bytes only
        return new EmitException(problem, hint, Source, _line, column);
    }

    private static string Printable(ReadOnlySpan<byte> token)
    {
        bool cut = token.Length > 24;
        var text = Encoding.UTF8.GetString(cut ? token[..24] : token);
        var sb = new StringBuilder();
        foreach (char c in text)
            sb.Append(char.IsControl(c) ? $"\\x{(int)c:x2}" : c);
        if (cut) sb.Append('…');
        return sb.ToString();
    }
}
