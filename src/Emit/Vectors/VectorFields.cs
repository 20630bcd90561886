namespace Emit.Vectors;

/// <summary>
/// The tokenizer of vector files (docs/vector-files.md): walks the values of one line, comma-separated (spaces and
/// tabs around values ignored) or separated by runs of spaces/tabs, returning byte offsets into the line so the
/// reader can report errors by line and column. Allocation-free (a ref struct over the line's bytes).
/// </summary>
internal ref struct VectorFields(ReadOnlySpan<byte> line, bool comma)
{
    /// <summary>The blanks around values: space and tab.</summary>
    public static bool IsSpace(byte b) => b is (byte)' ' or (byte)'\t';

    private readonly ReadOnlySpan<byte> _line = line;
    private int _i;
    private int _lastComma = -1;
    private bool _done;

    /// <summary>
    /// The next field: its kind, and its bytes as [start, end) (for Empty/Trailing, the separator's offset).
    /// </summary>
    public VectorFieldKind Next(out int start, out int end)
    {
        start = end = 0;
        if (_done) return VectorFieldKind.End;
        while (_i < _line.Length && IsSpace(_line[_i])) _i++;
        if (!comma)
        {
            if (_i == _line.Length) { _done = true; return VectorFieldKind.End; }
            start = _i;
            while (_i < _line.Length && !IsSpace(_line[_i])) _i++;
            end = _i;
            return VectorFieldKind.Value;
        }
        start = _i;
        int j = _line[_i..].IndexOf((byte)',');
        j = j < 0 ? _line.Length : _i + j;
        end = j;
        while (end > start && IsSpace(_line[end - 1])) end--;
        if (j == _line.Length)
        {
            _done = true;
            if (end > start) return VectorFieldKind.Value;
            start = end = _lastComma;
            return _lastComma >= 0 ? VectorFieldKind.Trailing : VectorFieldKind.End;
        }
        _lastComma = j;
        _i = j + 1;
        if (end == start)
        {
            start = end = j;
            return VectorFieldKind.Empty;
        }
        return VectorFieldKind.Value;
    }
}
