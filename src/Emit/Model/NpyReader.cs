using System.Buffers.Binary;
using System.Collections.Immutable;
using System.Globalization;
using System.Runtime.InteropServices;
using System.Text;

namespace Emit.Model;

/// <summary>
/// Reads one array in NumPy's NPY format as documented in <c>numpy.lib.format</c>: the magic string
/// <c>\x93NUMPY</c>, a major and minor version byte (1.0, 2.0 or 3.0), a little-endian header length
/// (2 bytes in 1.0, 4 bytes in 2.0/3.0), a Python dict literal with exactly the keys <c>descr</c>,
/// <c>fortran_order</c> and <c>shape</c>, then the raw data. Accepts float32 and float64 in either byte order
/// and either memory order; everything else is refused with an <see cref="EmitException"/> naming the file,
/// the entry and the byte position. Sizes are checked against a limit and against the bytes available before
/// anything is allocated.
/// </summary>
public static class NpyReader
{
    /// <summary>The six magic bytes every NPY array starts with.</summary>
    public static ReadOnlySpan<byte> Magic => [0x93, (byte)'N', (byte)'U', (byte)'M', (byte)'P', (byte)'Y'];

    /// <summary>Longest header accepted (numpy itself refuses headers over 10000 bytes by default).</summary>
    public const int MaxHeaderBytes = 1 << 16;

    private const int ChunkBytes = 1 << 16;

    /// <summary>Reads a whole NPY array from <paramref name="stream"/>.</summary>
    /// <param name="stream">Positioned at the magic string.</param>
    /// <param name="length">Total bytes of the NPY data when known (e.g. a zip entry's uncompressed length), or
    /// -1.</param>
    /// <param name="file">File named in errors.</param>
    /// <param name="entry">Entry named in errors, e.g. <c>weights.npy</c>.</param>
    /// <param name="maxElements">Most elements accepted; larger shapes are refused before allocation.</param>
    public static NpyArray Read(Stream stream, long length, string file, string entry, long maxElements)
    {
        var header = ReadHeader(stream, length, file, entry, maxElements);
        return ReadData(stream, header, file, entry);
    }

    /// <summary>Reads and checks the magic string and header, leaving the stream at the first data byte.</summary>
    public static NpyHeader ReadHeader(Stream stream, long length, string file, string entry, long maxElements)
    {
        var pre = new byte[12];
        int got = ReadFully(stream, pre.AsSpan(0, 8), file, entry, 0);
        if (got < 6 || !pre.AsSpan(0, 6).SequenceEqual(Magic))
        {
            if (got == 0) throw Error("is empty", "save the array again with numpy", file, entry, 0);
            throw Error("does not start with the NPY magic string \\x93NUMPY",
                "the entry is not a NumPy array; save it with numpy (np.savez)", file, entry, 0);
        }
        if (got < 8) throw Truncated(file, entry, got);
        int major = pre[6], minor = pre[7];
        if (major is < 1 or > 3 || minor != 0)
            throw Error($"has NPY format version {major}.{minor}",
                "this reader knows versions 1.0, 2.0 and 3.0; save with numpy's default format", file, entry, 6);
        int lengthBytes = major == 1 ? 2 : 4;
        got = ReadFully(stream, pre.AsSpan(8, lengthBytes), file, entry, 8);
        if (got < lengthBytes) throw Truncated(file, entry, 8 + got);
        long headerLength = major == 1 ? BinaryPrimitives.ReadUInt16LittleEndian(pre.AsSpan(8))
            : BinaryPrimitives.ReadUInt32LittleEndian(pre.AsSpan(8));
        long preamble = 8 + lengthBytes;
        if (headerLength > MaxHeaderBytes)
            throw Error($"declares a {headerLength}-byte header, more than the {MaxHeaderBytes} allowed",
                "the file is damaged or not written by numpy", file, entry, 8);
        if (length >= 0 && preamble + headerLength > length)
            throw Error($"declares a {headerLength}-byte header but the entry has only {length} bytes",
                "the file is truncated or damaged", file, entry, 8);
        var headerBytes = new byte[headerLength];
        got = ReadFully(stream, headerBytes, file, entry, preamble);
        if (got < headerLength) throw Truncated(file, entry, preamble + got);

        // Latin-1 keeps one character per byte, so positions below are byte positions in the entry. Version 3.0
        // headers are UTF-8, but non-ASCII text can only occur in structured dtypes, which are refused anyway.
        var text = Encoding.Latin1.GetString(headerBytes);
        var parser = new NpyHeaderLiteral(text, file, entry, preamble);
        var (descr, fortran, shape, count) = parser.ParseHeader(maxElements);

        long dataOffset = preamble + headerLength;
        long itemSize = descr[2] == '4' ? 4 : 8;
        long dataBytes = count * itemSize;   // count <= maxElements, so no overflow
        if (length >= 0 && length - dataOffset != dataBytes)
        {
            long have = length - dataOffset;
            throw Error(have < dataBytes
                    ? $"has shape {NpyHeader.FormatShape(shape)} of {descr} ({dataBytes} bytes of data) but only " +
                    $"{have} bytes follow the header"
                    : $"has {have - dataBytes} bytes after the {dataBytes} bytes its shape " +
                    $"{NpyHeader.FormatShape(shape)} of {descr} needs",
                have < dataBytes ? "the file is truncated or damaged" : "the file is damaged or not written by numpy",
                file, entry, dataOffset);
        }
        return new NpyHeader(major, descr, fortran, shape, count, dataOffset);
    }

    /// <summary>Reads the data described by <paramref name="header"/>; the stream must be at its first byte.</summary>
    public static NpyArray ReadData(Stream stream, NpyHeader header, string file, string entry)
    {
        var values = new double[header.Count];
        int itemSize = header.ItemSize;
        var chunk = new byte[(int)Math.Min(ChunkBytes, Math.Max(header.Count * itemSize, 1))];
        long done = 0;
        while (done < header.Count)
        {
            int items = (int)Math.Min(chunk.Length / itemSize, header.Count - done);
            var span = chunk.AsSpan(0, items * itemSize);
            long offset = header.DataOffset + done * itemSize;
            int got = ReadFully(stream, span, file, entry, offset);
            if (got < span.Length)
                throw Error(
                    $"ends after {done * itemSize + got} of the {header.Count * itemSize} data bytes its shape " +
                    $"{header.ShapeText} needs",
                    "the file is truncated", file, entry, offset + got);
            Convert(span, values.AsSpan((int)done, items), itemSize, header.BigEndian);
            done += items;
        }
        long end = header.DataOffset + header.Count * itemSize;
        if (ReadFully(stream, chunk.AsSpan(0, 1), file, entry, end) != 0)
            throw Error(
                $"has bytes after the {header.Count * itemSize} bytes of data its shape {header.ShapeText} needs",
                "the file is damaged or not written by numpy", file, entry, end);
        if (header.FortranOrder && header.Shape.Length > 1)
            values = FortranToC(values, header.Shape);
        return new NpyArray(entry, header, ImmutableCollectionsMarshal.AsImmutableArray(values));
    }

    private static void Convert(ReadOnlySpan<byte> bytes, Span<double> values, int itemSize, bool bigEndian)
    {
        if (itemSize == 8)
        {
            for (int k = 0; k < values.Length; k++)
            {
                var b = bytes.Slice(k * 8, 8);
                values[k] = bigEndian ? BinaryPrimitives.ReadDoubleBigEndian(b)
                    : BinaryPrimitives.ReadDoubleLittleEndian(b);
            }
        }
        else
        {
            for (int k = 0; k < values.Length; k++)
            {
                var b = bytes.Slice(k * 4, 4);
                values[k] = bigEndian ? BinaryPrimitives.ReadSingleBigEndian(b)
                    : BinaryPrimitives.ReadSingleLittleEndian(b);
            }
        }
    }

    /// <summary>Fortran order stores the first index fastest; rewrite to C order (last index fastest).</summary>
    private static double[] FortranToC(double[] f, ImmutableArray<long> shape)
    {
        int n = shape.Length;
        var stride = new long[n];
        stride[n - 1] = 1;
        for (int k = n - 2; k >= 0; k--) stride[k] = stride[k + 1] * shape[k + 1];
        var c = new double[f.Length];
        var index = new long[n];
        long target = 0;
        for (long p = 0; p < f.LongLength; p++)
        {
            c[target] = f[p];
            for (int k = 0; k < n; k++)
            {
                index[k]++;
                target += stride[k];
                if (index[k] < shape[k]) break;
                target -= stride[k] * index[k];
                index[k] = 0;
            }
        }
        return c;
    }

    /// <summary>Reads until <paramref name="buffer"/> is full or the stream ends; returns the bytes read.</summary>
    private static int ReadFully(Stream stream, Span<byte> buffer, string file, string entry, long offset)
    {
        try
        {
            return stream.ReadAtLeast(buffer, buffer.Length, throwOnEndOfStream: false);
        }
        catch (InvalidDataException e)
        {
            throw Error($"cannot be decompressed: {e.Message.TrimEnd('.')}",
                "the file is damaged; save it again with numpy", file, entry, offset);
        }
        catch (IOException e)
        {
            throw Error($"cannot be read: {e.Message.TrimEnd('.')}", null, file, entry, offset);
        }
    }

    private static EmitException Truncated(string file, string entry, long offset) =>
        Error("ends inside its header", "the file is truncated", file, entry, offset);

    internal static EmitException Error(string problem, string? hint, string file, string entry, long? offset) =>
        new(offset is { } o ? $"array entry {entry}, byte {o}: {problem}" : $"array entry {entry}: {problem}", hint,
            file);

    /// <summary>Describes a dtype string in words for error messages.</summary>
    internal static string DescribeDescr(string descr)
    {
        if (descr.Length < 2) return "an unknown type";
        char kind = descr[0] is '<' or '>' or '|' or '=' ? descr[1] : descr[0];
        string size = descr[0] is '<' or '>' or '|' or '=' ? descr[2..] : descr[1..];
        return kind switch
        {
            'f' => size is "4" or "8"
                ? "float with a byte order this reader does not know"
                : "float" + (int.TryParse(size, NumberStyles.None, CultureInfo.InvariantCulture, out int s)
                    ? (s * 8).ToString(CultureInfo.InvariantCulture)
                    : "?"),
            'i' => "signed integers",
            'u' => "unsigned integers",
            'b' => "booleans",
            'c' => "complex numbers",
            'O' => "pickled Python objects",
            'U' or 'S' or 'a' => "strings",
            'V' => "raw bytes or records",
            'M' or 'm' => "dates or time spans",
            _ => "an unknown type",
        };
    }

    /// <summary>Text from a file, cut short and with control characters escaped, safe for a one-line message.</summary>
    internal static string Printable(string s)
    {
        var sb = new StringBuilder();
        foreach (char c in s.Length > 24 ? s[..24] : s)
            sb.Append(
                c < ' ' || c is '\u007f' or > '\u00ff' || (c >= '\u0080' && c < '\u00a0') ? $"\\x{(int)c:x2}" : c);
        if (s.Length > 24) sb.Append('…');
        return sb.ToString();
    }
}
