using System.Numerics.Tensors;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Emit.Training;

/// <summary>
/// Products of a batch of 0/1 vectors with a dense matrix, as sums of the matrix rows the vectors select:
/// y[r, c] = bias[c] + Σ m[i, c] over the units i on in row r, added in ascending i. Every output element is summed
/// in that one order whatever the blocking or the thread count, so the trainer's results do not depend on them.
/// Work is split over blocks of output columns: a block of m (its rows × <see cref="BlockColumns"/> columns) is read
/// from cache for every batch row instead of all of m once per row, and each thread owns whole columns of y.
/// The additions run over contiguous runs of a row (<see cref="Add"/>; docs/train.md, "Speed").
/// </summary>
internal static class RowSums
{
    /// <summary>
    /// Columns per block: a block of a 784-row matrix (784 × 64 doubles, 0.4 MB) stays in a 1 MB L2 cache beside
    /// other work; 64 measured faster than 32 and 128 on the 784 × 500 benchmark (docs/train.md, "Speed").
    /// </summary>
    internal const int BlockColumns = 64;

    /// <summary>Number of column blocks of a matrix <paramref name="width"/> wide.</summary>
    public static int Blocks(int width) => (width + BlockColumns - 1) / BlockColumns;

    /// <summary>
    /// Column block <paramref name="block"/> of y (rows × width) for the first <paramref name="rows"/> rows of
    /// <paramref name="on"/>.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
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

    /// <summary>
    /// Rows [r0, r1) of the product, whole, with no bias, into y from its start: y[r - r0, c] = Σ m[i, c] over the
    /// units i on in row r.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static void Rows(OnUnits on, int r0, int r1, double[] m, int width, Span<double> y)
    {
        for (int r = r0; r < r1; r++)
        {
            var acc = y.Slice((r - r0) * width, width);
            acc.Clear();
            Add(on.Of(r), m, width, 0, acc);
        }
    }

    /// <summary>
    /// y[i, ·] = Σ m[r, ·] over the first <paramref name="rows"/> rows r of <paramref name="byRow"/> that have unit i
    /// on, rows in ascending order (the sums <see cref="Rows"/> makes from the transposed lists, the same additions in
    /// the same order), and count[i] = the number of those rows. Walks the rows once, adding each to the sums of the
    /// units it has on, so no transposed lists are needed; y (units × width) should stay in cache.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static void Scatter(OnUnits byRow, int rows, double[] m, int width, Span<double> y, Span<int> count)
    {
        y.Clear();
        count.Clear();
        for (int r = 0; r < rows; r++)
        {
            var src = new ReadOnlySpan<double>(m, r * width, width);
            foreach (int i in byRow.Of(r))
            {
                var dst = y.Slice(i * width, width);
                int c = 0;
                if (Vector512.IsHardwareAccelerated)
                    for (; c + 8 <= width; c += 8)
                        (Vector512.Create((ReadOnlySpan<double>)dst.Slice(c, 8)) + Vector512.Create(src.Slice(c, 8)))
                            .CopyTo(dst.Slice(c, 8));
                else if (Vector256.IsHardwareAccelerated)
                    for (; c + 4 <= width; c += 4)
                        (Vector256.Create((ReadOnlySpan<double>)dst.Slice(c, 4)) + Vector256.Create(src.Slice(c, 4)))
                            .CopyTo(dst.Slice(c, 4));
                for (; c < width; c++) dst[c] += src[c];
                count[i]++;
            }
        }
    }

    /// <summary>
    /// acc += m[i, c0 …] for each i in <paramref name="on"/>, in that order. Thirty-two (or sixteen, eight, four)
    /// columns at a time are held in vector registers while the rows are added, then stored once.
    /// TensorPrimitives.Add(acc, row, acc) per row loads and stores acc on every row and costs a call per row, which
    /// dominated the small benchmark's rows of 16 (docs/train.md, "Speed"); the additions, and so the bits, are the
    /// same at every vector width.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal static void Add(ReadOnlySpan<int> on, double[] m, int width, int c0, Span<double> acc)
    {
        int n = acc.Length, c = 0;
        if (Vector512.IsHardwareAccelerated)
        {
            const int Lane = 8; // Vector512<double>.Count
            for (; c + 4 * Lane <= n; c += 4 * Lane)
            {
                var a0 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c, Lane));
                var a1 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + Lane, Lane));
                var a2 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + 2 * Lane, Lane));
                var a3 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + 3 * Lane, Lane));
                foreach (int i in on)
                {
                    var row = new ReadOnlySpan<double>(m, i * width + c0 + c, 4 * Lane);
                    a0 += Vector512.Create(row[..Lane]);
                    a1 += Vector512.Create(row.Slice(Lane, Lane));
                    a2 += Vector512.Create(row.Slice(2 * Lane, Lane));
                    a3 += Vector512.Create(row.Slice(3 * Lane, Lane));
                }
                a0.CopyTo(acc.Slice(c, Lane));
                a1.CopyTo(acc.Slice(c + Lane, Lane));
                a2.CopyTo(acc.Slice(c + 2 * Lane, Lane));
                a3.CopyTo(acc.Slice(c + 3 * Lane, Lane));
            }
            if (c + 2 * Lane <= n)
            {
                var a0 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c, Lane));
                var a1 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + Lane, Lane));
                foreach (int i in on)
                {
                    var row = new ReadOnlySpan<double>(m, i * width + c0 + c, 2 * Lane);
                    a0 += Vector512.Create(row[..Lane]);
                    a1 += Vector512.Create(row.Slice(Lane, Lane));
                }
                a0.CopyTo(acc.Slice(c, Lane));
                a1.CopyTo(acc.Slice(c + Lane, Lane));
                c += 2 * Lane;
            }
            if (c + Lane <= n)
            {
                var a0 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c, Lane));
                foreach (int i in on) a0 += Vector512.Create(new ReadOnlySpan<double>(m, i * width + c0 + c, Lane));
                a0.CopyTo(acc.Slice(c, Lane));
                c += Lane;
            }
        }
        else if (Vector256.IsHardwareAccelerated)
        {
            const int Lane = 4; // Vector256<double>.Count
            for (; c + 4 * Lane <= n; c += 4 * Lane)
            {
                var a0 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c, Lane));
                var a1 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c + Lane, Lane));
                var a2 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c + 2 * Lane, Lane));
                var a3 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c + 3 * Lane, Lane));
                foreach (int i in on)
                {
                    var row = new ReadOnlySpan<double>(m, i * width + c0 + c, 4 * Lane);
                    a0 += Vector256.Create(row[..Lane]);
                    a1 += Vector256.Create(row.Slice(Lane, Lane));
                    a2 += Vector256.Create(row.Slice(2 * Lane, Lane));
                    a3 += Vector256.Create(row.Slice(3 * Lane, Lane));
                }
                a0.CopyTo(acc.Slice(c, Lane));
                a1.CopyTo(acc.Slice(c + Lane, Lane));
                a2.CopyTo(acc.Slice(c + 2 * Lane, Lane));
                a3.CopyTo(acc.Slice(c + 3 * Lane, Lane));
            }
        }
        if (Vector256.IsHardwareAccelerated)
            for (; c + 4 <= n; c += 4) // the last columns of a row, four at a time in one register
            {
                var a0 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c, 4));
                foreach (int i in on) a0 += Vector256.Create(new ReadOnlySpan<double>(m, i * width + c0 + c, 4));
                a0.CopyTo(acc.Slice(c, 4));
            }
        if (c == n) return;
        var rest = acc[c..];
        foreach (int i in on) TensorPrimitives.Add(rest, m.AsSpan(i * width + c0 + c, rest.Length), rest);
    }

    /// <summary>
    /// acc[c] += m[j, c] · a[j] for j = 0, 1, … in that order, each product rounded before it is added (no fused
    /// multiply-add): the operations of TensorPrimitives.MultiplyAdd(m row j, a[j], acc, acc) for each j, with
    /// thirty-two (or sixteen) columns of acc held in registers over all j instead of a call and a load and store of
    /// acc per j. m is a.Length × acc.Length.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    internal static void AddScaled(ReadOnlySpan<double> a, double[] m, Span<double> acc)
    {
        int n = acc.Length, c = 0;
        if (Vector512.IsHardwareAccelerated)
        {
            const int Lane = 8; // Vector512<double>.Count
            for (; c + 4 * Lane <= n; c += 4 * Lane)
            {
                var a0 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c, Lane));
                var a1 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + Lane, Lane));
                var a2 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + 2 * Lane, Lane));
                var a3 = Vector512.Create((ReadOnlySpan<double>)acc.Slice(c + 3 * Lane, Lane));
                for (int j = 0; j < a.Length; j++)
                {
                    var row = new ReadOnlySpan<double>(m, j * n + c, 4 * Lane);
                    var s = Vector512.Create(a[j]);
                    a0 += Vector512.Create(row[..Lane]) * s;
                    a1 += Vector512.Create(row.Slice(Lane, Lane)) * s;
                    a2 += Vector512.Create(row.Slice(2 * Lane, Lane)) * s;
                    a3 += Vector512.Create(row.Slice(3 * Lane, Lane)) * s;
                }
                a0.CopyTo(acc.Slice(c, Lane));
                a1.CopyTo(acc.Slice(c + Lane, Lane));
                a2.CopyTo(acc.Slice(c + 2 * Lane, Lane));
                a3.CopyTo(acc.Slice(c + 3 * Lane, Lane));
            }
        }
        else if (Vector256.IsHardwareAccelerated)
        {
            const int Lane = 4; // Vector256<double>.Count
            for (; c + 4 * Lane <= n; c += 4 * Lane)
            {
                var a0 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c, Lane));
                var a1 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c + Lane, Lane));
                var a2 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c + 2 * Lane, Lane));
                var a3 = Vector256.Create((ReadOnlySpan<double>)acc.Slice(c + 3 * Lane, Lane));
                for (int j = 0; j < a.Length; j++)
                {
                    var row = new ReadOnlySpan<double>(m, j * n + c, 4 * Lane);
                    var s = Vector256.Create(a[j]);
                    a0 += Vector256.Create(row[..Lane]) * s;
                    a1 += Vector256.Create(row.Slice(Lane, Lane)) * s;
                    a2 += Vector256.Create(row.Slice(2 * Lane, Lane)) * s;
                    a3 += Vector256.Create(row.Slice(3 * Lane, Lane)) * s;
                }
                a0.CopyTo(acc.Slice(c, Lane));
                a1.CopyTo(acc.Slice(c + Lane, Lane));
                a2.CopyTo(acc.Slice(c + 2 * Lane, Lane));
                a3.CopyTo(acc.Slice(c + 3 * Lane, Lane));
            }
        }
        if (c == n) return;
        var rest = acc[c..];
        for (int j = 0; j < a.Length; j++)
            TensorPrimitives.MultiplyAdd(m.AsSpan(j * n + c, rest.Length), a[j], rest, rest);
    }
}
