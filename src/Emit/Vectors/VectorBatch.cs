namespace Emit.Vectors;

/// <summary>
/// How many vectors one batch of <see cref="VectorReader.ReadBatch(Span{byte}, int)"/> holds: at most
/// <see cref="MaxRows"/>, and at most <see cref="MaxBytes"/> of unpacked units (one byte per unit), so a model with
/// 2^20 visible units reads 16 rows at a time instead of asking for a 4 GiB buffer (the size arithmetic is in
/// <see langword="long"/>, since 4096 × 2^20 does not fit an <see langword="int"/>).
/// </summary>
public static class VectorBatch
{
    /// <summary>Most rows in a batch.</summary>
    public const int MaxRows = 4096;

    /// <summary>Most bytes of unpacked units in a batch (16 MiB).</summary>
    public const long MaxBytes = 16L << 20;

    /// <summary>
    /// Rows per batch for vectors of <paramref name="visible"/> units: between 1 and <paramref name="maxRows"/>.
    /// </summary>
    public static int Rows(int visible, int maxRows = MaxRows)
    {
        ArgumentOutOfRangeException.ThrowIfNegative(visible);
        long byBytes = MaxBytes / Math.Max(1L, visible);
        return (int)Math.Clamp(byBytes, 1, Math.Max(1, maxRows));
    }
}
