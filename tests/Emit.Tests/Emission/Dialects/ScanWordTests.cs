using System.Numerics;
using Emit.Emission.Dialects;

namespace Emit.Tests.Emission.Dialects;

/// <summary>
/// The word scan's De Bruijn tables against .NET's <see cref="BitOperations.TrailingZeroCount(ulong)"/> (the
/// reference), and how the packed input splits into words.
/// </summary>
public sealed class ScanWordTests
{
    [Theory]
    [InlineData(64)]
    [InlineData(32)]
    public void The_table_gives_the_lowest_set_bit_of_every_power_of_two_and_of_random_words(int bits)
    {
        var word = ScanWord.For(100).Single(w => w.Bits == bits);
        ulong mask = bits == 64 ? ulong.MaxValue : uint.MaxValue;
        Assert.Equal(bits, word.LowestBit.Count);
        Assert.Equal(Enumerable.Range(0, bits), word.LowestBit.Order());
        int Lookup(ulong w) => word.LowestBit[(int)((((w & (0UL - w)) * word.DeBruijnValue) & mask) >> word.Shift)];
        for (int n = 0; n < bits; n++) Assert.Equal(n, Lookup(1UL << n));
        var rng = new Random(5);
        for (int k = 0; k < 100_000; k++)
        {
            ulong w = (ulong)rng.NextInt64() & mask;
            if (w == 0) continue;
            Assert.Equal(BitOperations.TrailingZeroCount(w), Lookup(w));
        }
    }

    [Theory]
    // visible, 64-bit: whole words, tail bytes, mask; 32-bit: whole words, tail bytes, mask (worked out by hand:
    // ⌈V/8⌉ bytes split into 8- or 4-byte words, and the low V − 64·(words − 1) (or 32·…) bits of the last one)
    [InlineData(2, 0, 1, "0x3u", 0, 1, "0x3u")]
    [InlineData(32, 0, 4, null, 1, 0, null)]
    [InlineData(56, 0, 7, null, 1, 3, null)]
    [InlineData(64, 1, 0, null, 2, 0, null)]
    [InlineData(65, 1, 1, "0x1u", 2, 1, "0x1u")]
    [InlineData(784, 12, 2, null, 24, 2, null)]
    [InlineData(100, 1, 5, "0xFFFFFFFFFu", 3, 1, "0xFu")]
    public void The_input_splits_into_whole_words_and_a_last_partial_one(int visible, int full64, int tail64,
        string? mask64, int full32, int tail32, string? mask32)
    {
        var words = ScanWord.For(visible);
        Assert.Equal([64, 32], words.Select(w => w.Bits));
        Assert.Equal((full64, tail64, mask64), (words[0].FullWords, words[0].TailBytes, words[0].LastMask));
        Assert.Equal((full32, tail32, mask32), (words[1].FullWords, words[1].TailBytes, words[1].LastMask));
        foreach (var w in words)
        {
            Assert.Equal(w.FullWords + (w.TailBytes > 0 ? 1 : 0), w.Words);
            Assert.Equal((visible + 7) / 8, w.FullWords * w.Bytes + w.TailBytes);
        }
    }
}
