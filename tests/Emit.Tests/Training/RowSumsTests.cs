using Emit.Training;
using MathNet.Numerics.LinearAlgebra;

namespace Emit.Tests.Training;

/// <summary>
/// The trainer's 0/1-times-dense products: bit for bit the plain definition (bias, then the selected rows added in
/// ascending order, one element at a time), and close to MathNet.Numerics' dense product (an outside implementation
/// whose summation order differs, so agreement is to rounding).
/// </summary>
public sealed class RowSumsTests
{
    [Theory]
    [InlineData(7, 3, 5)]      // one four-column register and a one-column TensorPrimitives tail
    [InlineData(10, 64, 16)]   // the small benchmark's shape
    [InlineData(13, 100, 150)] // several column blocks, a partial last block, a tail after the sixteen-column groups
    [InlineData(5, 20, 53)]    // one block of 32 + 16 + 4 + 1 columns: every register group width and the tail
    [InlineData(6, 211, 9)]    // rows of 211 units: three 64-unit masks, a 16-unit mask, three single units
    public void Products_equal_the_in_order_sum_and_MathNet(int rows, int depth, int width)
    {
        var rng = new SplitMix64((ulong)(rows * 1000 + width));
        var m = new double[depth * width];
        for (int k = 0; k < m.Length; k++) m[k] = (2 * rng.NextDouble() - 1) * Math.Pow(10, rng.NextBelow(6) - 3);
        var bias = new double[width];
        for (int c = 0; c < width; c++) bias[c] = rng.NextDouble() - 0.5;
        var x = new byte[rows * depth];
        for (int k = 0; k < x.Length; k++) x[k] = rng.Chance(0.3) ? (byte)1 : (byte)0;
        var on = new OnUnits(rows, depth);
        for (int r = 0; r < rows; r++) on.Set(r, x.AsSpan(r * depth, depth));
        for (int r = 0; r < rows; r++) // the units on, ascending
            Assert.Equal(Enumerable.Range(0, depth).Where(i => x[r * depth + i] == 1), on.Of(r).ToArray());
        var y = new double[rows * width];
        for (int b = 0; b < RowSums.Blocks(width); b++) RowSums.Block(b, on, rows, m, bias, y);

        var dense = Matrix<double>.Build.Dense(rows, depth, (r, i) => x[r * depth + i]) *
            Matrix<double>.Build.Dense(depth, width, (i, c) => m[i * width + c]);
        for (int r = 0; r < rows; r++)
            for (int c = 0; c < width; c++)
            {
                double expected = bias[c];
                for (int i = 0; i < depth; i++)
                    if (x[r * depth + i] == 1) expected += m[i * width + c];
                Assert.Equal(BitConverter.DoubleToInt64Bits(expected), BitConverter.DoubleToInt64Bits(y[r * width + c]));
                Assert.True(Math.Abs(bias[c] + dense[r, c] - y[r * width + c]) <= 1e-12, $"({r}, {c}) against MathNet");
            }

        // The transposed lists: unit i's rows with x[r, i] = 1, ascending; Rows sums them without a bias.
        var columns = new OnUnits(depth, rows);
        columns.SetTransposed(on, rows);
        var yt = new double[depth * width];
        var mr = new double[rows * width];
        Array.Copy(m, mr, Math.Min(m.Length, mr.Length));
        RowSums.Rows(columns, 0, depth, mr, width, yt);
        for (int i = 0; i < depth; i++)
        {
            var expectedRows = Enumerable.Range(0, rows).Where(r => x[r * depth + i] == 1).ToArray();
            Assert.Equal(expectedRows, columns.Of(i).ToArray());
            for (int c = 0; c < width; c++)
            {
                double expected = 0;
                foreach (int r in expectedRows) expected += mr[r * width + c];
                Assert.Equal(BitConverter.DoubleToInt64Bits(expected), BitConverter.DoubleToInt64Bits(yt[i * width + c]));
            }
        }

        // Scatter makes the same sums from the row lists (each row added to the units it has on, rows in order).
        var ys = new double[depth * width];
        Array.Fill(ys, double.NaN);
        var counts = new int[depth];
        RowSums.Scatter(on, rows, mr, width, ys, counts);
        Assert.Equal(yt.Select(BitConverter.DoubleToInt64Bits), ys.Select(BitConverter.DoubleToInt64Bits));
        for (int i = 0; i < depth; i++) Assert.Equal(columns.Of(i).Length, counts[i]);
    }
}
