using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Emit.Training;

/// <summary>
/// The units that are on (1) in each row of a batch of binary vectors, in ascending order: the sparse form the
/// trainer's matrix products walk, since a product with a 0/1 vector is a sum of selected rows.
/// </summary>
internal sealed class OnUnits
{
    private readonly int _width;
    private readonly int[] _index; // rows × width, row r's first Count(r) entries used
    private readonly int[] _count;

    public OnUnits(int rows, int width)
    {
        _width = width;
        _index = new int[rows * width];
        _count = new int[rows];
    }

    /// <summary>
    /// Records which units of <paramref name="v"/> (0/1 values) are on, as row <paramref name="r"/>. Sixty-four (or
    /// sixteen) units at a time become a bit mask whose set bits are listed, so the work follows the units that are on.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Set(int r, ReadOnlySpan<byte> v)
    {
        var index = _index.AsSpan(r * _width, _width);
        int n = 0, i = 0;
        if (Vector512.IsHardwareAccelerated)
            for (; i + 64 <= v.Length; i += 64)
            {
                ulong mask = Vector512.GreaterThan(Vector512.Create(v.Slice(i, 64)), Vector512<byte>.Zero)
                    .ExtractMostSignificantBits();
                for (; mask != 0; mask &= mask - 1) index[n++] = i + BitOperations.TrailingZeroCount(mask);
            }
        if (Vector128.IsHardwareAccelerated)
            for (; i + 16 <= v.Length; i += 16)
            {
                uint mask = Vector128.GreaterThan(Vector128.Create(v.Slice(i, 16)), Vector128<byte>.Zero)
                    .ExtractMostSignificantBits();
                for (; mask != 0; mask &= mask - 1) index[n++] = i + BitOperations.TrailingZeroCount(mask);
            }
        for (; i < v.Length; i++)
        {
            index[n] = i;
            n += v[i]; // 0 or 1: branch-free
        }
        _count[r] = n;
    }

    /// <summary>
    /// The transposed form of the first <paramref name="rows"/> rows of <paramref name="byRow"/>: for each unit i (a
    /// "row" of this object, which has one per unit), the rows r of <paramref name="byRow"/> in ascending order that
    /// have unit i on. Walks only the units that are on (about a third in typical binary data), not every unit.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void SetTransposed(OnUnits byRow, int rows)
    {
        var count = _count.AsSpan();
        count.Clear();
        var index = _index.AsSpan();
        for (int r = 0; r < rows; r++)
            foreach (int i in byRow.Of(r)) index[i * _width + count[i]++] = r;
    }

    /// <summary>The units on in row <paramref name="r"/>, ascending.</summary>
    public ReadOnlySpan<int> Of(int r) => _index.AsSpan(r * _width, _count[r]);
}
