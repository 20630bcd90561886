using System.Numerics.Tensors;

namespace Emit.Training;

/// <summary>
/// Products of a batch of 0/1 vectors with a dense matrix, as sums of the matrix rows the vectors select:
/// y[r, c] = bias[c] + Σ m[i, c] over the units i on in row r, added in ascending i. Every output element is summed
/// in that one order whatever the blocking or the thread count, so the trainer's results do not depend on them.
/// Work is split over blocks of output columns: a block of m (its rows × <see cref="BlockColumns"/> columns) is read
/// from cache for every batch row instead of all of m once per row, and each thread owns whole columns of y.
/// The additions are TensorPrimitives.Add over contiguous runs of a row (docs/train.md, "Speed").
/// </summary>
internal static class RowSums
{
    /// <summary>Columns per block: a block of a 784-row matrix (784 × 128 doubles, 0.8 MB) stays in a 1 MB L2 cache.</summary>
    internal const int BlockColumns = 128;

    /// <summary>Number of column blocks of a matrix <paramref name="width"/> wide.</summary>
    public static int Blocks(int width) => (width + BlockColumns - 1) / BlockColumns;

    /// <summary>Column block <paramref name="block"/> of y (rows × width) for the first <paramref name="rows"/> rows of <paramref name="on"/>.</summary>
    public static void Block(int block, OnUnits on, int rows, double[] m, double[] bias, double[] y)
    {
        int width = bias.Length;
        int c0 = block * BlockColumns, n = Math.Min(BlockColumns, width - c0);
        var b = bias.AsSpan(c0, n);
        for (int r = 0; r < rows; r++)
        {
            var acc = y.AsSpan(r * width + c0, n);
            b.CopyTo(acc);
            Add(on.Of(r), m, width, c0, acc);
        }
    }

    /// <summary>Rows [r0, r1) of y (… × width), whole, with no bias: y[r, c] = Σ m[i, c] over the units i on in row r.</summary>
    public static void Rows(OnUnits on, int r0, int r1, double[] m, int width, double[] y)
    {
        for (int r = r0; r < r1; r++)
        {
            var acc = y.AsSpan(r * width, width);
            acc.Clear();
            Add(on.Of(r), m, width, 0, acc);
        }
    }

    private static void Add(ReadOnlySpan<int> on, double[] m, int width, int c0, Span<double> acc)
    {
        foreach (int i in on) TensorPrimitives.Add(acc, m.AsSpan(i * width + c0, acc.Length), acc);
    }
}
