namespace Emit.Model;

/// <summary>
/// Wraps a zip entry's data stream and compares the CRC-32 of everything read with the checksum the archive
/// records for the entry when the stream ends. The zip reader of .NET does not check stored entries, and a
/// flipped byte in a weight must not pass silently. CRC-32 as zip uses it: reflected polynomial 0xEDB88320,
/// initial value and final XOR 0xFFFFFFFF (PKWARE APPNOTE.TXT section 4.4.7; CRC catalogue name CRC-32/ISO-HDLC).
/// </summary>
internal sealed class Crc32CheckStream(Stream inner, uint expected, Func<uint, uint, Exception> mismatch) : Stream
{
    private static readonly uint[] Table = BuildTable();
    private uint _crc = 0xFFFFFFFFu;
    private bool _checked;

    /// <summary>CRC-32 of <paramref name="data"/> (zip, gzip and PNG use this one).</summary>
    public static uint Compute(ReadOnlySpan<byte> data) => Update(0xFFFFFFFFu, data) ^ 0xFFFFFFFFu;

    private static uint[] BuildTable()
    {
        var table = new uint[256];
        for (uint n = 0; n < 256; n++)
        {
            uint c = n;
            for (int k = 0; k < 8; k++) c = (c & 1) != 0 ? 0xEDB88320u ^ (c >> 1) : c >> 1;
            table[n] = c;
        }
        return table;
    }

    private static uint Update(uint crc, ReadOnlySpan<byte> data)
    {
        foreach (byte b in data) crc = Table[(crc ^ b) & 0xFF] ^ (crc >> 8);
        return crc;
    }

    public override int Read(Span<byte> buffer)
    {
        int n = inner.Read(buffer);
        if (n > 0) _crc = Update(_crc, buffer[..n]);
        else if (buffer.Length > 0 && !_checked)
        {
            _checked = true;
            uint actual = _crc ^ 0xFFFFFFFFu;
            if (actual != expected) throw mismatch(expected, actual);
        }
        return n;
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => throw new NotSupportedException();
    public override long Position { get => throw new NotSupportedException(); set => throw new NotSupportedException(); }
    public override void Flush() { }
    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();

    protected override void Dispose(bool disposing)
    {
        if (disposing) inner.Dispose();
        base.Dispose(disposing);
    }
}
