using System.Collections.Immutable;

namespace Emit.Model;

/// <summary>
/// The header of one NPY array as NumPy documents it (<c>numpy.lib.format</c>): format version, element type
/// (<c>descr</c>), memory order and shape. Only float32/float64 in either byte order get this far.
/// </summary>
public sealed class NpyHeader
{
    internal NpyHeader(int majorVersion, string descr, bool fortranOrder, ImmutableArray<long> shape, long count,
        long dataOffset)
    {
        MajorVersion = majorVersion;
        Descr = descr;
        FortranOrder = fortranOrder;
        Shape = shape;
        Count = count;
        DataOffset = dataOffset;
    }

    /// <summary>NPY format major version: 1, 2 or 3 (minor is always 0).</summary>
    public int MajorVersion { get; }

    /// <summary>The element type as written, e.g. <c>&lt;f8</c> or <c>&gt;f4</c>.</summary>
    public string Descr { get; }

    /// <summary>True when the data is in column-major (Fortran) order.</summary>
    public bool FortranOrder { get; }

    /// <summary>The array's dimensions; empty for a 0-d (scalar) array.</summary>
    public ImmutableArray<long> Shape { get; }

    /// <summary>Number of elements (the product of <see cref="Shape"/>).</summary>
    public long Count { get; }

    /// <summary>Bytes per element: 4 or 8.</summary>
    public int ItemSize => Descr[2] == '4' ? 4 : 8;

    /// <summary>True for big-endian data (<c>&gt;</c>).</summary>
    public bool BigEndian => Descr[0] == '>';

    /// <summary>Offset of the first data byte from the start of the NPY data (magic string included).</summary>
    public long DataOffset { get; }

    /// <summary>The shape as numpy prints it, e.g. <c>(64, 16)</c> or <c>(5,)</c>.</summary>
    public string ShapeText => FormatShape(Shape);

    internal static string FormatShape(IReadOnlyList<long> shape) =>
        shape.Count == 1 ? $"({shape[0]},)" : "(" + string.Join(", ", shape) + ")";
}
