using System.Collections.Immutable;
using System.Text;

namespace Emit.Model;

/// <summary>
/// The parser of the Python literal in an NPY header (<c>numpy.lib.format</c>): a dict with exactly the keys
/// <c>descr</c>, <c>fortran_order</c> and <c>shape</c>, whose values are strings, True/False and a tuple of integers.
/// Only that subset of Python literals is accepted (strings, integers, True/False/None, tuples and lists nested at
/// most <see cref="MaxNesting"/> deep); errors name the file, the entry and the byte position.
/// </summary>
internal sealed class NpyHeaderLiteral(string text, string file, string entry, long baseOffset)
{
    private const int MaxNesting = 8;

    private int _i;

    private EmitException Fail(string problem, string? hint = null, int? at = null) =>
        NpyReader.Error("header " + problem, hint ?? "the file is damaged or not written by numpy", file, entry,
            baseOffset + (at ?? _i));

    public (string Descr, bool Fortran, ImmutableArray<long> Shape, long Count) ParseHeader(long maxElements)
    {
        SkipSpace();
        if (_i >= text.Length || text[_i] != '{') throw Fail("is not a Python dict literal");
        string? descr = null; bool? fortran = null; ImmutableArray<long>? shape = null; long count = 1;
        _i++;
        while (true)
        {
            SkipSpace();
            if (Peek() == '}') { _i++; break; }
            int keyAt = _i;
            if (ParseValue(0) is not string key) throw Fail("has a dict key that is not a string", null, keyAt);
            SkipSpace();
            if (Peek() != ':') throw Fail("expects ':' after a key");
            _i++;
            SkipSpace();
            int valueAt = _i;
            object? value = ParseValue(0);
            switch (key)
            {
                case "descr" when descr is null:
                    if (value is List<object?>)
                        throw Fail("describes a structured (record) dtype",
                            "save a plain float64 or float32 array (arr.astype(np.float64))", valueAt);
                    if (value is not string d) throw Fail("has a 'descr' that is not a string", null, valueAt);
                    if (d is not ("<f8" or ">f8" or "<f4" or ">f4"))
                        throw Fail($"has dtype '{NpyReader.Printable(d)}' ({NpyReader.DescribeDescr(d)})",
                            "save float64 or float32 values (arr.astype(np.float64))", valueAt);
                    descr = d;
                    break;
                case "fortran_order" when fortran is null:
                    fortran = value as bool?
                    ?? throw Fail("has a 'fortran_order' that is not True or False", null, valueAt);
                    break;
                case "shape" when shape is null:
                    if (value is not Tuple t) throw Fail("has a 'shape' that is not a tuple", null, valueAt);
                    var dims = ImmutableArray.CreateBuilder<long>(t.Items.Count);
                    foreach (var item in t.Items)
                    {
                        if (item is not long dim || dim < 0)
                            throw Fail("has a 'shape' entry that is not a non-negative integer", null, valueAt);
                        dims.Add(dim);
                    }
                    shape = dims.ToImmutable();
                    break;
                case "descr" or "fortran_order" or "shape":
                    throw Fail($"has the key '{key}' twice", null, keyAt);
                default:
                    throw Fail($"has an unexpected key '{NpyReader.Printable(key)}'",
                        "an NPY header has exactly 'descr', 'fortran_order' and 'shape'", keyAt);
            }
            SkipSpace();
            if (Peek() == ',') { _i++; continue; }
            if (Peek() == '}') { _i++; break; }
            throw Fail("expects ',' or '}' in the dict");
        }
        SkipSpace();
        if (_i != text.Length) throw Fail("has text after the dict");
        if (descr is null) throw Fail("has no 'descr'");
        if (fortran is null) throw Fail("has no 'fortran_order'");
        if (shape is null) throw Fail("has no 'shape'");
        if (shape.Value.IsEmpty)
            throw Fail("has shape () (a single number)", "save a 1-d or 2-d array");
        bool empty = shape.Value.Contains(0);
        count = empty ? 0 : 1;
        if (!empty)
        {
            foreach (long dim in shape.Value)
            {
                if (dim > maxElements || count > maxElements / dim)
                    throw NpyReader.Error(
                        $"has shape {NpyHeader.FormatShape(shape.Value)}, more than the {maxElements} elements allowed",
                        "the file is damaged, or the model is too large for emit", file, entry, baseOffset);
                count *= dim;
            }
        }
        return (descr, fortran.Value, shape.Value, count);
    }

    private sealed record Tuple(List<object?> Items);

    private char Peek() => _i < text.Length ? text[_i] : '\0';

    private void SkipSpace()
    {
        while (_i < text.Length && text[_i] is ' ' or '\t' or '\n' or '\r') _i++;
    }

    private object? ParseValue(int depth)
    {
        if (depth > MaxNesting) throw Fail("nests too deeply");
        SkipSpace();
        char c = Peek();
        switch (c)
        {
            case '\'' or '"': return ParseString(c);
            case '(': return new Tuple(ParseSequence(')', depth, tuple: true));
            case '[': return ParseSequence(']', depth, tuple: false);
            case '{':
                throw Fail("has a nested dict");
            case >= '0' and <= '9' or '-' or '+': return ParseInteger();
        }
        foreach (var (word, value) in new (string, object?)[] { ("True", true), ("False", false), ("None", null) })
            if (string.CompareOrdinal(text, _i, word, 0, word.Length) == 0)
            {
                _i += word.Length;
                return value;
            }
        throw Fail(
            _i >= text.Length ? "ends early" : $"has an unexpected character '{NpyReader.Printable(c.ToString())}'");
    }

    private List<object?> ParseSequence(char close, int depth, bool tuple)
    {
        int open = _i;
        _i++;
        var items = new List<object?>();
        bool comma = false;
        while (true)
        {
            SkipSpace();
            if (Peek() == close) { _i++; break; }
            if (items.Count >= 64) throw Fail("has a sequence that is too long");
            items.Add(ParseValue(depth + 1));
            SkipSpace();
            if (Peek() == ',') { _i++; comma = true; continue; }
            if (Peek() == close) { _i++; break; }
            throw Fail($"expects ',' or '{close}'");
        }
        // In Python "(3)" is the number 3, not a tuple; numpy always writes "(3,)".
        if (tuple && items.Count == 1 && !comma)
            throw Fail("has a parenthesised value that is not a tuple", null, open);
        return items;
    }

    private string ParseString(char quote)
    {
        int start = _i++;
        var sb = new StringBuilder();
        while (true)
        {
            if (_i >= text.Length || text[_i] == '\n') throw Fail("has an unterminated string", null, start);
            char c = text[_i++];
            if (c == quote) return sb.ToString();
            if (c == '\\')
            {
                if (_i >= text.Length) throw Fail("has an unterminated string", null, start);
                c = text[_i++];
            }
            sb.Append(c);
            if (sb.Length > 256) throw Fail("has a string that is too long", null, start);
        }
    }

    private long ParseInteger()
    {
        int start = _i;
        bool negative = false;
        if (text[_i] is '-' or '+') negative = text[_i++] == '-';
        if (_i >= text.Length || text[_i] is < '0' or > '9') throw Fail("has a malformed number", null, start);
        long value = 0;
        while (_i < text.Length && text[_i] is >= '0' and <= '9')
        {
            int digit = text[_i++] - '0';
            // Saturate: any dimension this large is refused by the size check anyway.
            value = value > (long.MaxValue - digit) / 10 ? long.MaxValue : value * 10 + digit;
        }
        if (Peek() is 'L' or 'l') _i++;   // Python 2 long literal, as old numpy wrote shapes
        if (Peek() is '.' or 'e' or 'E' or 'j' or 'x') throw Fail("has a number that is not an integer", null, start);
        return negative ? -value : value;
    }
}
