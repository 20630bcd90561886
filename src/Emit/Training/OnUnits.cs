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

    /// <summary>Records which units of <paramref name="v"/> are on, as row <paramref name="r"/>.</summary>
    public void Set(int r, ReadOnlySpan<byte> v)
    {
        var index = _index.AsSpan(r * _width, _width);
        int n = 0;
        for (int i = 0; i < v.Length; i++)
        {
            index[n] = i;
            n += v[i]; // 0 or 1: branch-free
        }
        _count[r] = n;
    }

    /// <summary>
    /// The transposed form: for each unit i (a "row" of this object), the rows r in ascending order with
    /// units[rowIndex(r) × width + i] = 1, for the first <paramref name="rows"/> rows. rowIndex(r) is
    /// <paramref name="order"/>[start + r], or r when <paramref name="order"/> is empty.
    /// </summary>
    public void SetColumns(byte[] units, int width, int rows, ReadOnlySpan<int> order, int start)
    {
        var count = _count.AsSpan(0, width);
        count.Clear();
        for (int r = 0; r < rows; r++)
        {
            var row = units.AsSpan((order.IsEmpty ? r : order[start + r]) * width, width);
            for (int i = 0; i < width; i++)
            {
                int c = count[i];
                _index[i * _width + c] = r;
                count[i] = c + row[i];
            }
        }
    }

    /// <summary>The units on in row <paramref name="r"/>, ascending.</summary>
    public ReadOnlySpan<int> Of(int r) => _index.AsSpan(r * _width, _count[r]);
}
