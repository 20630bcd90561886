namespace Emit.Model;

/// <summary>
/// Wraps a zip entry's data stream and compares the CRC-32 of everything read with the checksum the archive
/// records for the entry when the stream ends. The zip reader of .NET does not check stored entries, and a
/// flipped byte in a weight must not pass silently. CRC-32 as zip uses it: reflected polynomial 0xEDB88320,
/// initial value and final XOR 0xFFFFFFFF (PKWARE APPNOTE.TXT section 4.4.7; CRC catalogue name CRC-32/ISO-HDLC), as
/// computed by System.IO.Hashing.Crc32 (the IEEE 802.3 CRC-32 per its documentation, cited from memory; the test
/// checks the catalogue's check value 0xCBF43926 for "123456789").
/// </summary>
internal sealed class Crc32CheckStream(Stream inner, uint expected, Func<uint, uint, Exception> mismatch) : Stream
{
    private readonly System.IO.Hashing.Crc32 _crc = new();
    private bool _checked;

    /// <summary>CRC-32 of <paramref name="data"/> (zip, gzip and PNG use this one).</summary>
    public static uint Compute(ReadOnlySpan<byte> data) => System.IO.Hashing.Crc32.HashToUInt32(data);

    public override int Read(Span<byte> buffer)
    {
        int n = inner.Read(buffer);
        if (n > 0) _crc.Append(buffer[..n]);
        else if (buffer.Length > 0 && !_checked)
        {
            _checked = true;
            uint actual = _crc.GetCurrentHashAsUInt32();
            if (actual != expected) throw mismatch(expected, actual);
        }
        return n;
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => throw new NotSupportedException();
    public override long Position
    {
        get => throw new NotSupportedException();
        set => throw new NotSupportedException();
    }
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
