using System.Collections.Immutable;

namespace Emit.Model;

/// <summary>One array read from NPY data: its header and its values widened to double, in C (row-major) order
/// whatever order the file stored them in.</summary>
public sealed class NpyArray
{
    internal NpyArray(string entry, NpyHeader header, ImmutableArray<double> values)
    {
        Entry = entry;
        Header = header;
        Values = values;
    }

    /// <summary>Where the array came from, e.g. the zip entry name <c>weights.npy</c>.</summary>
    public string Entry { get; }

    /// <summary>The parsed .npy header (dtype, order, shape).</summary>
    public NpyHeader Header { get; }

    /// <summary>The array's dimensions.</summary>
    public ImmutableArray<long> Shape => Header.Shape;

    /// <summary>All elements in C order: for shape (r, c), element [i, j] is at i * c + j.</summary>
    public ImmutableArray<double> Values { get; }
}
