using System.Globalization;
using System.Numerics;

namespace Emit.Emission.Dialects;

/// <summary>
/// The speed-optimized bit scan's word of <see cref="Bits"/> input bits: how the packed input splits into words, and
/// the De Bruijn constant and table that give a word's lowest set bit. The lowest set bit n of a word w: w &amp; −w is
/// 2^n, and the top log2(Bits) bits of 2^n · <see cref="DeBruijn"/> (modulo 2^Bits) are different for every n, so
/// <see cref="LowestBit"/> maps them back to n (Leiserson, Prokop and Randall, "Using de Bruijn Sequences to Index a 1
/// in a Computer Word", MIT, 1998). Compilers that know the idiom (gcc, clang) emit their count-trailing-zeros
/// instruction for the lookup.
/// </summary>
public sealed record ScanWord
{
    private ScanWord(int bits, ulong deBruijn, int visible)
    {
        Bits = bits;
        int packedBytes = (visible + 7) / 8, bytes = bits / 8;
        FullWords = packedBytes / bytes;
        TailBytes = packedBytes % bytes;
        Words = FullWords + (TailBytes > 0 ? 1 : 0);
        int log2 = BitOperations.Log2((uint)bits);
        Shift = bits - log2;
        ulong mask = bits == 64 ? ulong.MaxValue : (1UL << bits) - 1;
        var table = new int[bits];
        for (int n = 0; n < bits; n++) table[(int)((((1UL << n) * deBruijn) & mask) >> Shift)] = n;
        LowestBit = table;
        DeBruijn = "0x" + deBruijn.ToString(bits == 64 ? "X16" : "X8", CultureInfo.InvariantCulture) + "u";
        DeBruijnValue = deBruijn;
        int lastBits = visible - (Words - 1) * bits;
        LastMask = visible % 8 == 0 ? null
            : "0x" + ((1UL << lastBits) - 1).ToString("X", CultureInfo.InvariantCulture) + "u";
        Layout = (FullWords, TailBytes) switch
        {
            (_, 0) => Count(FullWords, "whole word"),
            (0, _) => $"one word of {Count(TailBytes, "byte")}: the input is shorter than a word",
            _ => $"{Count(FullWords, "whole word")} and a last word of {Count(TailBytes, "byte")}",
        };
    }

    private static string Count(int n, string noun) => n == 1 ? $"1 {noun}" : $"{n} {noun}s";

    /// <summary>The words for 64-bit targets and for 32-bit ones, with <paramref name="visible"/> inputs.</summary>
    /// <remarks>
    /// The 32-bit constant is the one in Leiserson, Prokop and Randall's paper; the 64-bit one is written from memory
    /// (a De Bruijn sequence in common use). ScanWordTests checks that each gives every bit position a table entry of
    /// its own and agrees with BitOperations.TrailingZeroCount.
    /// </remarks>
    public static IReadOnlyList<ScanWord> For(int visible) =>
        [new ScanWord(64, 0x03F79D71B4CA8B09UL, visible), new ScanWord(32, 0x077CB531UL, visible)];

    /// <summary>Bits a word: 64 or 32.</summary>
    public int Bits { get; }

    /// <summary>Bytes a word: 8 or 4.</summary>
    public int Bytes => Bits / 8;

    /// <summary>How the packed input splits into words, for a comment.</summary>
    public string Layout { get; }

    /// <summary>Words of the packed input read whole.</summary>
    public int FullWords { get; }

    /// <summary>Bytes of the last word when the input is not whole words (0: it is).</summary>
    public int TailBytes { get; }

    /// <summary>Words of the packed input, the partial last one included.</summary>
    public int Words { get; }

    /// <summary>The right shift that leaves the top log2(Bits) bits of the product.</summary>
    public int Shift { get; }

    /// <summary>The De Bruijn constant as a C literal.</summary>
    public string DeBruijn { get; }

    /// <summary>The De Bruijn constant.</summary>
    public ulong DeBruijnValue { get; }

    /// <summary>Entry k: the n whose 2^n · <see cref="DeBruijn"/> has k in its top bits.</summary>
    public IReadOnlyList<int> LowestBit { get; }

    /// <summary>
    /// The mask of the last word's bits that are units, as a C literal; null when the last byte is whole (the words
    /// read only the packed input's bytes, so every bit read is a unit).
    /// </summary>
    public string? LastMask { get; }
}
