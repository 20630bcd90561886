using System.Text;
using Emit.Vectors;

namespace Emit.Tests.Vectors;

/// <summary>
/// The vector file reader. Layout rules are the ones documented on <see cref="VectorReader"/>; header quoting
/// follows RFC 4180 section 2 (fields may be enclosed in double quotes, a quote inside is written twice);
/// CRLF line ends are RFC 4180's, LF common practice; the UTF-8 byte-order mark EF BB BF is Unicode's (section 23.8).
/// </summary>
public sealed class VectorReaderTests
{
    private static VectorReader Reader(string text, int? width = null) =>
        new(new MemoryStream(Encoding.UTF8.GetBytes(text)), "v.csv", width);

    private static VectorReader Reader(byte[] bytes, int? width = null) => new(new MemoryStream(bytes), "v.csv", width);

    private static List<string> ReadAll(VectorReader r)
    {
        var rows = new List<string>();
        var units = new byte[r.Width];
        while (r.TryRead(units)) rows.Add(string.Concat(units.Select(u => (char)('0' + u))));
        return rows;
    }

    private static EmitException Fails(string text, int? width = null) => Fails(Encoding.UTF8.GetBytes(text), width);

    private static EmitException Fails(byte[] bytes, int? width = null)
    {
        var e = Assert.Throws<EmitException>(() =>
        {
            using var r = Reader(bytes, width);
            ReadAll(r);
        });
        Assert.Equal("v.csv", e.File);
        return e;
    }

    [Theory]
    [InlineData("0,1,1\n1,0,0\n")]
    [InlineData("0, 1, 1\n1 ,0,\t0\n")]
    [InlineData("0 1 1\n1 0 0\n")]
    [InlineData("0\t1\t1\n1  0 \t 0")]          // no final newline
    [InlineData("0,1,1\r\n1,0,0\r\n")]          // CRLF
    [InlineData("\uFEFF0,1,1\n1,0,0\n")]         // byte-order mark
    [InlineData("\n  \n0,1,1\n\n\t\n1,0,0\n\n")] // blank lines anywhere
    [InlineData("  0,1,1  \n1,0,0\t\n")]         // leading/trailing spaces
    public void Accepted_layouts_give_the_same_vectors(string text)
    {
        using var r = Reader(text, 3);
        Assert.Equal(["011", "100"], ReadAll(r));
        Assert.True(r.Names.IsEmpty);
        Assert.Equal(2, r.RowsRead);
    }

    [Fact]
    public void Header_is_recognised_when_the_first_line_is_not_all_0_1()
    {
        using var r = Reader("door_open,fan 1,alarm\n0,1,1\n");
        Assert.Equal(["door_open", "fan 1", "alarm"], r.Names.ToArray());
        Assert.Equal(3, r.Width);
        Assert.Equal(1, r.HeaderLine);
        Assert.Equal(["011"], ReadAll(r));
        Assert.Equal(2, r.LastLine);
    }

    [Theory]
    [InlineData("0,1,2\n1,1,1\n", 3)]   // pandas' default column labels
    [InlineData("1 2 3\n1 1 1\n", 3)]
    public void Column_numbers_are_a_header(string text, int width)
    {
        using var r = Reader(text, width);
        Assert.Equal(width, r.Names.Length);
        Assert.Equal(["111"], ReadAll(r));
    }

    [Theory]
    [InlineData("0,2,1\n1,1,1\n", 3)]
    [InlineData("1,0,1.0\n1,1,1\n", 5)]
    public void A_first_line_of_other_numbers_is_a_bad_vector_not_a_header(string text, int column)
    {
        // column: characters from 1 where the bad value starts
        var e = Fails(text, 3);
        Assert.StartsWith("value '", e.Problem);
        Assert.Equal(1, e.Line);
        Assert.Equal(column, e.Column);
    }

    [Fact]
    public void Header_names_may_be_quoted_as_in_RFC_4180()
    {
        using var r = Reader("\"door, rear\", \"say \"\"hi\"\"\",plain,\"\u00e9t\u00e9\"\n0,0,1,1\n");
        Assert.Equal(["door, rear", "say \"hi\"", "plain", "\u00e9t\u00e9"], r.Names.ToArray());
        Assert.Equal(["0011"], ReadAll(r));
    }

    [Fact]
    public void Whitespace_separated_header_with_quotes()
    {
        using var r = Reader("a \"b c\"\td\n1 1 0\n");
        Assert.Equal(["a", "b c", "d"], r.Names.ToArray());
        Assert.Equal(VectorSeparator.Whitespace, r.Separator);
    }

    [Fact]
    public void Header_only_file_is_refused_like_an_empty_file()
    {
        // One rule for score, classify, diff and verify (docs/vector-files.md): names without vectors are an error.
        var e = Assert.Throws<EmitException>(() => ReadAll(Reader("a,b\n\n", 2)));
        Assert.Contains("header but no vectors", e.Problem);
        Assert.Equal(1, e.Line);
    }

    [Theory]
    [InlineData("0,1,0\v\n1,1,1\n", 5)]        // trailing VT on the first vector
    [InlineData("0,1,0\u00A0\n1,1,1\n", 5)]    // trailing NBSP
    [InlineData("0,1,\u200B0\n1,1,1\n", 5)]    // zero-width space
    [InlineData("1,true,0\n1,1,1\n", 3)]
    [InlineData("1 FALSE 0\n1 1 1\n", 3)]
    [InlineData("0,1,0.5\n1,1,1\n", 5)]
    public void A_mistyped_first_vector_is_reported_not_taken_for_a_header(string text, int column)
    {
        // column: characters from 1 where the bad value starts
        var e = Fails(text, 3);
        Assert.Equal(1, e.Line);
        Assert.Equal(column, e.Column);
        Assert.Contains("is not 0 or 1", e.Problem);
    }

    [Theory]
    [InlineData("door,fan,alarm\n0,1,0\n")]
    [InlineData("\"door, rear\",fan 2,\u00E9t\u00E9\n0,1,0\n")]
    [InlineData("0,1,2\n0,1,0\n")]          // column numbers 0..n-1
    [InlineData("1,2,3\n0,1,0\n")]          // column numbers 1..n
    public void A_header_of_names_is_still_a_header(string text)
    {
        using var r = Reader(text, 3);
        Assert.Equal(3, r.Names.Length);
        Assert.Equal(["010"], ReadAll(r));
    }

    [Fact]
    public void Width_is_taken_from_the_first_line_when_not_given()
    {
        using var r = Reader("1 0 1 1\n0 0 0 0\n");
        Assert.Equal(4, r.Width);
        Assert.Equal(["1011", "0000"], ReadAll(r));
    }

    [Fact]
    public void Standard_input_is_read_for_dash()
    {
        var stdin = new MemoryStream(Encoding.UTF8.GetBytes("1,0\n"));
        using var r = VectorReader.Open("-", 2, stdin);
        Assert.Equal(VectorReader.StdinName, r.Source);
        Assert.Equal(["10"], ReadAll(r));
    }

    [Fact]
    public void Batches_fill_consecutive_rows_and_continue_where_they_stopped()
    {
        var text = new StringBuilder("x,y\n");
        for (int k = 0; k < 10; k++) text.Append(k & 1).Append(',').Append((k >> 1) & 1).Append('\n');
        using var r = Reader(text.ToString(), 2);
        var buffer = new byte[8];
        var all = new List<byte>();
        int n;
        while ((n = r.ReadBatch(buffer, 4)) > 0) all.AddRange(buffer.Take(n * 2));
        var expected = Enumerable.Range(0, 10).SelectMany(k => new[] { (byte)(k & 1), (byte)((k >> 1) & 1) });
        Assert.Equal(expected, all);
        Assert.Equal(10, r.RowsRead);
        Assert.Equal(11, r.LastLine);
    }

    [Theory]
    [InlineData("0,1,1\n0,1\n", 2, 4, "line has 2 values, expected 3")]
    [InlineData("0,1,1\n0,1,1,0\n", 2, 7, "line has 4 values, expected 3")]
    [InlineData("0,1,1\n0,2,1\n", 2, 3, "value '2' is not 0 or 1")]
    [InlineData("0,1,1\n0,yes,1\n", 2, 3, "value 'yes' is not 0 or 1")]
    [InlineData("0,1,1\n0,1.0,1\n", 2, 3, "value '1.0' is not 0 or 1")]
    [InlineData("0,1,1\n0,1,1,\n", 2, 6, "line ends with a separator ','")]
    [InlineData("0,1,1,\n", 1, 6, "line ends with a separator ','")]
    [InlineData("0,1,1\n0,,1\n", 2, 3, "empty value before ','")]
    [InlineData("0,1,1\n,0,1\n", 2, 1, "empty value before ','")]
    [InlineData("0,1,1\n0 1 1\n", 2, 1, "value '0 1 1' is not 0 or 1")]
    [InlineData("0 1 1\n0,1,1\n", 2, 1, "value '0,1,1' is not 0 or 1")]
    [InlineData("0,1,1\n011\n", 2, 1, "value '011' is not 0 or 1")]
    [InlineData("0,1,1\r\n\r\n1,\u00e9,1\r\n", 3, 3, "value '\u00e9' is not 0 or 1")]
    [InlineData("\u00e9,b,c\n1,1,\u00e9\u00e9\n", 2, 5, "value '\u00e9\u00e9' is not 0 or 1")]   // columns count characters
    [InlineData("0,1,1\n0,1,\u0000\n", 2, 5, "value '\\x00' is not 0 or 1")]
    public void Bad_rows_name_line_and_column(string text, int line, int column, string problem)
    {
        var e = Fails(text, 3);
        Assert.Equal(problem, e.Problem[..problem.Length]);
        Assert.Equal(line, e.Line);
        Assert.Equal(column, e.Column);
        Assert.False(string.IsNullOrEmpty(e.Hint));
    }

    [Theory]
    [InlineData("a,b\n", 3, "header has 2 names, expected 3")]
    [InlineData("a,,c\n", 3, "header name 2 is empty")]
    [InlineData("a,b,c,\n", 3, "header ends with a separator ','")]
    [InlineData("a,\"b,c\n", 3, "header has a quote that is not closed")]
    [InlineData("a,\"b\"x,c\n", 3, "header has text after a quoted name")]
    [InlineData("", 3, "file has no vectors (it is empty)")]
    [InlineData("\uFEFF\r\n \n", 3, "file has no vectors (it is empty)")]
    public void Bad_headers_and_empty_files(string text, int width, string problem)
    {
        var e = Fails(text, width);
        Assert.Equal(problem, e.Problem);
    }

    [Fact]
    public void Header_that_is_not_UTF8_is_refused()
    {
        var e = Fails([(byte)'a', (byte)',', 0xff, 0xfe, (byte)'\n']);
        Assert.Equal("header is not valid UTF-8 text", e.Problem);
        Assert.Equal(3, e.Column);
    }

    [Fact]
    public void Missing_file_and_folder_are_refused()
    {
        var missing = Path.Combine(Path.GetTempPath(), "emit-no-such-" + Guid.NewGuid() + ".csv");
        Assert.Contains("not found", Assert.Throws<EmitException>(() => VectorReader.Open(missing, 3)).Problem);
        Assert.Contains("folder", Assert.Throws<EmitException>(() => VectorReader.Open(Path.GetTempPath(), 3)).Problem);
    }

    [Fact]
    public void Reads_a_file_from_disk_written_by_python()
    {
        // Written by tests/reference/make_fixtures.py: a header of 64 names, then 200 rows (all-off, all-on, digits).
        using var r = VectorReader.Open(Path.Combine(AppContext.BaseDirectory, "Model", "Fixtures", "sklearn_digits_vectors.csv"), 64);
        Assert.Equal("r0c0", r.Names[0]);
        Assert.Equal("r7c7", r.Names[63]);
        var rows = ReadAll(r);
        Assert.Equal(200, rows.Count);
        Assert.Equal(new string('0', 64), rows[0]);
        Assert.Equal(new string('1', 64), rows[1]);
    }

    [Fact]
    public void A_line_without_end_is_refused_once_it_passes_the_limit()
    {
        // The public limit is VectorReader.MaxLineBytes (64 MiB); the same code path with a 1 MiB limit here.
        var e = Assert.Throws<EmitException>(() => new VectorReader(new RepeatingStream("0,"u8.ToArray(), long.MaxValue / 2), "big.csv", 3, false, 1 << 20));
        Assert.Contains($"longer than {1 << 20} bytes", e.Problem);
        Assert.Equal(1, e.Line);
    }

    [Fact]
    public void Millions_of_rows_stream_without_allocating_per_row()
    {
        // Constant memory: the allocation count over 2 million rows stays below one row's worth of objects each.
        const long rows = 2_000_000;
        using var r = new VectorReader(new RepeatingStream("1,0,1,1\n"u8.ToArray(), rows), "many.csv", 4);
        var buffer = new byte[4 * 1024];
        long read = 0, ones = 0;
        long before = GC.GetAllocatedBytesForCurrentThread();
        int n;
        while ((n = r.ReadBatch(buffer, 1024)) > 0)
        {
            read += n;
            for (int k = 0; k < n * 4; k++) ones += buffer[k];
        }
        long allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Equal(rows, read);
        Assert.Equal(3 * rows, ones);
        Assert.True(allocated < 1 << 20, $"{allocated} bytes allocated for {rows} rows");
    }

    [Fact]
    public void Random_damage_gives_vectors_or_the_tool_error_only()
    {
        var original = Encoding.UTF8.GetBytes("\uFEFFdoor,\"fan, rear\",alarm\r\n0,1,1\r\n\r\n1, 0 ,0\r\n1,1,1\n0,0,0");
        var random = new Random(11);
        int ok = 0, errors = 0;
        for (int round = 0; round < 3000; round++)
        {
            var b = new List<byte>(original);
            for (int k = 0, edits = 1 + random.Next(3); k < edits && b.Count > 0; k++)
            {
                int at = random.Next(b.Count);
                switch (random.Next(4))
                {
                    case 0: b[at] = (byte)random.Next(256); break;
                    case 1: b.Insert(at, "01,\n\r \"x\u00e9"u8[random.Next(9)]); break;
                    case 2: b.RemoveAt(at); break;
                    default: b.RemoveRange(at, b.Count - at); break;
                }
            }
            try
            {
                using var r = Reader(b.ToArray(), random.Next(2) == 0 ? 3 : null);
                ReadAll(r);
                ok++;
            }
            catch (EmitException e)
            {
                Assert.Equal("v.csv", e.File);
                Assert.NotNull(e.Line);
                Assert.DoesNotContain('\n', e.OneLine());
                errors++;
            }
            catch (Exception e)
            {
                Assert.Fail($"round {round}: {e.GetType().Name}: {e.Message}\n{Convert.ToHexString(b.ToArray())}");
            }
        }
        Assert.True(ok > 0 && errors > 0);
    }

    /// <summary>A read-only stream repeating a pattern, without holding the whole text in memory.</summary>
    private sealed class RepeatingStream(byte[] pattern, long repeats) : Stream
    {
        private long _position;
        private readonly long _length = repeats > long.MaxValue / pattern.Length ? long.MaxValue : repeats * pattern.Length;

        public override int Read(byte[] buffer, int offset, int count)
        {
            int n = (int)Math.Min(count, _length - _position);
            int done = 0;
            while (done < n)
            {
                int phase = (int)(_position % pattern.Length);
                int take = Math.Min(n - done, pattern.Length - phase);
                pattern.AsSpan(phase, take).CopyTo(buffer.AsSpan(offset + done));
                done += take;
                _position += take;
            }
            return n;
        }

        public override bool CanRead => true;
        public override bool CanSeek => false;
        public override bool CanWrite => false;
        public override long Length => _length;
        public override long Position { get => _position; set => throw new NotSupportedException(); }
        public override void Flush() { }
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
        public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
    }
}
