using Emit.Training;

namespace Emit.Tests.Training;

/// <summary>The trainer's transpose of W (tiled, with an eight-lane register transpose for whole tiles).</summary>
public sealed class ParametersTests
{
    // The definition of the transpose: WT[j, i] = W[i, j], for shapes with whole 16 × 16 tiles only (64 × 16), with
    // partial tiles on either side (40 × 33, 17 × 5), and the large benchmark's 784 × 500.
    [Theory]
    [InlineData(64, 16)]
    [InlineData(40, 33)]
    [InlineData(17, 5)]
    [InlineData(784, 500)]
    public void Transpose_is_the_transpose(int visible, int hidden)
    {
        var p = new Parameters(visible, hidden, false, false);
        var rng = new SplitMix64((ulong)(visible * 1000 + hidden));
        for (int k = 0; k < p.W.Length; k++) p.W[k] = rng.NextDouble() - 0.5;
        Array.Fill(p.WT, double.NaN);
        p.Transpose();
        for (int i = 0; i < visible; i++)
            for (int j = 0; j < hidden; j++)
                Assert.Equal(BitConverter.DoubleToInt64Bits(p.W[i * hidden + j]),
                    BitConverter.DoubleToInt64Bits(p.WT[j * visible + i]));
    }
}
