using System.IO.Compression;
using System.Text;
using Emit.Model;

namespace Emit.Tests.Model;

/// <summary>
/// Damaged, hand-made and hostile .npz/.npy input. The NPY layout used to build the hand-made entries is the one
/// NumPy documents in numpy.lib.format (magic \x93NUMPY, version bytes, little-endian header length, dict
/// literal). The only outcomes allowed are a model or an <see cref="EmitException"/> naming the file.
/// </summary>
public sealed class NpzDamageTests
{
    private const string File = "hand.npz";

    /// <summary>NPY bytes as numpy.lib.format describes them: magic, version, header length, header, data.</summary>
    private static byte[] Npy(string dict, byte[] data, int major = 1, int pad = 0)
    {
        var header = Encoding.Latin1.GetBytes(dict + new string(' ', pad) + "\n");
        var ms = new MemoryStream();
        ms.Write(NpyReader.Magic);
        ms.WriteByte((byte)major);
        ms.WriteByte(0);
        if (major == 1) ms.Write(BitConverter.GetBytes((ushort)header.Length));
        else ms.Write(BitConverter.GetBytes((uint)header.Length));
        ms.Write(header);
        ms.Write(data);
        return ms.ToArray();
    }

    private static byte[] Doubles(params double[] xs) => xs.SelectMany(x => BitConverter.GetBytes(x)).ToArray();

    private static string Dict(string descr, string shape, bool fortran = false) =>
        $"{{'descr': '{descr}', 'fortran_order': {(fortran ? "True" : "False")}, 'shape': {shape}, }}";

    private static MemoryStream Zip(params (string Name, byte[] Bytes)[] entries)
    {
        var ms = new MemoryStream();
        using (var zip = new ZipArchive(ms, ZipArchiveMode.Create, leaveOpen: true))
            foreach (var (name, bytes) in entries)
            {
                using var s = zip.CreateEntry(name, CompressionLevel.NoCompression).Open();
                s.Write(bytes);
            }
        ms.Position = 0;
        return ms;
    }

    private static (string, byte[])[] Valid(byte[]? weights = null, byte[]? visible = null, byte[]? hidden = null) =>
    [
        ("weights.npy", weights ?? Npy(Dict("<f8", "(2, 1)"), Doubles(0.5, -0.25))),
        ("visible_bias.npy", visible ?? Npy(Dict("<f8", "(2,)"), Doubles(1, 2))),
        ("hidden_bias.npy", hidden ?? Npy(Dict("<f8", "(1,)"), Doubles(3))),
    ];

    private static EmitException Refused(MemoryStream zip)
    {
        var e = Assert.Throws<EmitException>(() => NpzModelReader.Read(zip, File));
        Assert.Equal(File, e.File);
        return e;
    }

    [Fact]
    public void Hand_made_archive_in_the_documented_layout_is_read()
    {
        var m = NpzModelReader.Read(Zip(Valid()), File);
        Assert.Equal([0.5, -0.25], m.Weights.ToArray());
        Assert.Equal([1.0, 2.0], m.VisibleBias.ToArray());
    }

    [Fact]
    public void Fortran_order_of_a_three_dimensional_array_is_rewritten_to_C_order()
    {
        // numpy.lib.format: with fortran_order True the data is the array's column-major (first index fastest) layout.
        var data = Doubles(Enumerable.Range(0, 24).Select(k => (double)k).ToArray());
        var a = NpyReader.Read(new MemoryStream(Npy(Dict("<f8", "(2, 3, 4)", fortran: true), data)), -1, File, "a.npy", 100);
        for (int i = 0; i < 2; i++)
            for (int j = 0; j < 3; j++)
                for (int k = 0; k < 4; k++)
                    Assert.Equal(i + 2 * j + 6 * k, a.Values[i * 12 + j * 4 + k]);
    }

    [Theory]
    [InlineData("{'descr': '<f8', 'fortran_order': False}", "has no 'shape'")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': (2,), 'extra': 1}", "unexpected key 'extra'")]
    [InlineData("{'descr': '<f8', 'descr': '<f8', 'fortran_order': False, 'shape': (2,)}", "'descr' twice")]
    [InlineData("{'descr': '<f8', 'fortran_order': 0, 'shape': (2,)}", "not True or False")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': (2)}", "not a tuple")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': (-2,)}", "non-negative integer")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': (2.0,)}", "not an integer")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': ()}", "shape ()")]
    [InlineData("{'descr': '=f8', 'fortran_order': False, 'shape': (2,)}", "dtype '=f8'")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': (2,)", "',' or '}'")]
    [InlineData("{'descr': '<f8, 'fortran_order': False, 'shape': (2,)}", "dtype '<f8, '")]
    [InlineData("['<f8', False, (2,)]", "not a Python dict")]
    [InlineData("{'descr': '<f8', 'fortran_order': False, 'shape': ((((((((((2,),),),),),),),),),)}", "nests too deeply")]
    public void Malformed_headers_are_refused_with_entry_and_byte(string dict, string problem)
    {
        var e = Refused(Zip(Valid(visible: Npy(dict, Doubles(1, 2)))));
        Assert.Contains("array entry visible_bias.npy, byte ", e.Problem);
        Assert.Contains(problem, e.Problem);
    }

    [Fact]
    public void Old_python2_long_literals_in_the_shape_are_accepted()
    {
        // numpy under Python 2 wrote shapes such as (2L,); numpy.lib.format still reads them.
        var m = NpzModelReader.Read(Zip(Valid(visible: Npy(Dict("<f8", "(2L,)"), Doubles(1, 2)))), File);
        Assert.Equal(2, m.Visible);
    }

    [Theory]
    [InlineData("(1099511627776,)", "more than the 1048576 elements allowed")]         // 2^40 units
    [InlineData("(99999999999999999999999999,)", "more than the 1048576 elements allowed")]
    [InlineData("(1000000,)", "only 16 bytes follow the header")]                       // fits the limit, not the entry
    [InlineData("(1,)", "has 8 bytes after the 8 bytes")]
    public void Absurd_or_inconsistent_sizes_are_refused_before_allocating(string shape, string problem)
    {
        var zip = Zip(Valid(visible: Npy(Dict("<f8", shape), Doubles(1, 2))));
        long before = GC.GetAllocatedBytesForCurrentThread();
        var e = Refused(zip);
        long allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        Assert.Contains(problem, e.Problem);
        Assert.True(allocated < 1 << 20, $"{allocated} bytes allocated while refusing");
    }

    [Fact]
    public void Weight_matrix_beyond_the_model_limit_is_refused_from_its_header()
    {
        // Shape check against the biases happens before reading any weight data.
        var e = Refused(Zip(Valid(weights: Npy(Dict("<f8", "(100000, 100000)"), []))));
        Assert.Contains("weights.npy", e.Problem);
        Assert.Contains("more than the 134217728 elements allowed", e.Problem);
    }

    [Fact]
    public void Npy_versions_2_and_3_use_a_four_byte_header_length()
    {
        var v2 = Npy(Dict("<f8", "(2,)"), Doubles(1, 2), major: 2);
        var v3 = Npy(Dict(">f4", "(1,)"), [0x3f, 0xc0, 0, 0], major: 3); // 1.5f big-endian
        var m = NpzModelReader.Read(Zip(Valid(visible: v2, hidden: v3)), File);
        Assert.Equal(1.5, m.HiddenBias[0]);
        var v4 = Npy(Dict("<f8", "(2,)"), Doubles(1, 2), major: 4);
        Assert.Contains("version 4.0", Refused(Zip(Valid(visible: v4))).Problem);
    }

    [Fact]
    public void Entry_without_magic_string_or_empty_is_refused()
    {
        Assert.Contains("NPY magic", Refused(Zip(Valid(visible: Encoding.ASCII.GetBytes("1,2\n")))).Problem);
        Assert.Contains("visible_bias.npy, byte 0: is empty", Refused(Zip(Valid(visible: []))).Problem);
    }

    [Fact]
    public void Duplicate_entries_are_refused()
    {
        var entries = Valid().Append(("weights.npy", Npy(Dict("<f8", "(2, 1)"), Doubles(9, 9)))).ToArray();
        Assert.Contains("weights.npy appears twice", Refused(Zip(entries)).Problem);
    }

    [Fact]
    public void Archive_without_arrays_lists_what_it_found()
    {
        Assert.Contains("has no .npy arrays", Refused(Zip(("readme.txt", [1, 2]))).Problem);
        Assert.Contains("found w.npy", Refused(Zip(("w.npy", Npy(Dict("<f8", "(1,)"), Doubles(1))))).Problem);
    }

    [Theory]
    [InlineData(new byte[0], "file is empty")]
    [InlineData(new byte[] { 0x7b, 0x22, 0x66 }, "not a readable zip archive")]            // '{"f', a JSON file
    [InlineData(new byte[] { 0x50, 0x4b, 0x03, 0x04, 0, 0 }, "not a readable zip archive")]  // a zip signature, then nothing
    public void Non_zip_input_is_refused(byte[] bytes, string problem)
    {
        Assert.Contains(problem, Refused(new MemoryStream(bytes)).Problem);
    }

    [Fact]
    public void Crc32_matches_the_published_check_value()
    {
        // CRC-32/ISO-HDLC check value for the ASCII string "123456789" is 0xCBF43926 (Greg Cook's catalogue of
        // parametrised CRC algorithms; Python's zlib.crc32(b"123456789") gives the same).
        Assert.Equal(0xCBF43926u, Crc32CheckStream.Compute("123456789"u8));
    }

    [Fact]
    public void A_flipped_weight_byte_in_a_stored_entry_fails_the_checksum()
    {
        var bytes = System.IO.File.ReadAllBytes(NpzFixtures.Path("fmt_f8_le_c_stored.npz"));
        int magic = bytes.AsSpan().IndexOf(NpyReader.Magic);   // first entry: weights.npy, 128-byte preamble+header
        bytes[magic + 128 + 3] ^= 0x10;
        var e = Assert.Throws<EmitException>(() => NpzModelReader.Read(new MemoryStream(bytes), "flip.npz"));
        Assert.Contains("array entry weights.npy: fails its checksum", e.Problem);
    }

    [Theory]
    [InlineData("fmt_f8_be_f_deflated.npz")]
    [InlineData("fmt_f4_le_f_stored.npz")]
    public void Every_truncation_of_a_numpy_file_is_refused(string name)
    {
        var bytes = System.IO.File.ReadAllBytes(NpzFixtures.Path(name));
        for (int n = 0; n < bytes.Length; n++)
        {
            var e = Assert.Throws<EmitException>(() => NpzModelReader.Read(new MemoryStream(bytes, 0, n), name));
            Assert.Equal(name, e.File);
        }
    }

    [Theory]
    [InlineData("fmt_f8_be_f_deflated.npz", 1)]
    [InlineData("fmt_f4_le_f_stored.npz", 2)]
    [InlineData("fmt_savez_compressed.npz", 3)]
    public void Random_damage_gives_a_model_or_the_tool_error_only(string name, int seed)
    {
        var original = System.IO.File.ReadAllBytes(NpzFixtures.Path(name));
        var random = new Random(seed);
        int models = 0, errors = 0;
        for (int round = 0; round < 1500; round++)
        {
            var bytes = Mutate(original, random);
            try
            {
                NpzModelReader.Read(new MemoryStream(bytes), name);
                models++;
            }
            catch (EmitException e)
            {
                Assert.Equal(name, e.File);
                Assert.DoesNotContain('\n', e.OneLine());
                errors++;
            }
            catch (Exception e)
            {
                Assert.Fail($"round {round} (seed {seed}): {e.GetType().Name}: {e.Message}\n{Convert.ToHexString(bytes)}");
            }
        }
        Assert.True(errors > 0);
        Assert.Equal(1500, models + errors);
    }

    private static byte[] Mutate(byte[] original, Random random)
    {
        var b = new List<byte>(original);
        int edits = 1 + random.Next(3);
        for (int k = 0; k < edits && b.Count > 0; k++)
        {
            int at = random.Next(b.Count);
            switch (random.Next(5))
            {
                case 0: b[at] ^= (byte)(1 << random.Next(8)); break;
                case 1: b[at] = (byte)random.Next(256); break;
                case 2: b.InsertRange(at, Enumerable.Range(0, 1 + random.Next(8)).Select(_ => (byte)random.Next(256))); break;
                case 3: b.RemoveRange(at, Math.Min(b.Count - at, 1 + random.Next(16))); break;
                default: b.RemoveRange(at, b.Count - at); break;
            }
        }
        return b.ToArray();
    }
}
