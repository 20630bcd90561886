using System.Security.Cryptography;

namespace Emit.Training;

/// <summary>A read-through stream that hashes (SHA-256) every byte read; <see cref="Finish"/> reads what is left and returns the hash.</summary>
internal sealed class HashingReadStream(Stream inner, bool leaveOpen) : Stream
{
    private readonly IncrementalHash _hash = IncrementalHash.CreateHash(HashAlgorithmName.SHA256);

    public byte[] Finish()
    {
        var buffer = new byte[1 << 16];
        while (Read(buffer, 0, buffer.Length) > 0) { }
        return _hash.GetHashAndReset();
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    public override int Read(Span<byte> buffer)
    {
        int n = inner.Read(buffer);
        _hash.AppendData(buffer[..n]);
        return n;
    }

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
        if (disposing)
        {
            _hash.Dispose();
            if (!leaveOpen) inner.Dispose();
        }
        base.Dispose(disposing);
    }
}
