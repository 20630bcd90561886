using Emit.Training;

namespace Emit.Tests.Training;

/// <summary>
/// TrainingMath against the platform's C library (<see cref="Math.Exp"/>, <see cref="Math.Log(double)"/>, glibc on
/// Linux): an independent implementation of the same functions.
/// </summary>
public sealed class TrainingMathTests
{
    private static void Close(double expected, double actual, double relative, string what) =>
        Assert.True(Math.Abs(actual - expected) <= relative * Math.Abs(expected), $"{what}: {actual:R} vs {expected:R}");

    [Fact]
    public void Exp_agrees_with_the_C_library_across_the_normal_range()
    {
        var rng = new SplitMix64(3);
        for (int k = 0; k < 200000; k++)
        {
            double x = -708 + rng.NextDouble() * (709.7 + 708);
            Close(Math.Exp(x), TrainingMath.Exp(x), 4e-16, $"exp({x:R})");
        }
        for (double x = -40; x <= 40; x += 0.001953125) Close(Math.Exp(x), TrainingMath.Exp(x), 4e-16, $"exp({x:R})");
    }

    [Fact]
    public void Exp_special_values()
    {
        Assert.Equal(1.0, TrainingMath.Exp(0.0));
        Close(Math.E, TrainingMath.Exp(1.0), 2.3e-16, "exp(1)");
        Assert.Equal(double.PositiveInfinity, TrainingMath.Exp(710));
        Assert.True(double.IsFinite(TrainingMath.Exp(709.78)));
        Assert.Equal(0.0, TrainingMath.Exp(-746));
        Assert.True(TrainingMath.Exp(-740) > 0); // subnormal, as in the C library
        Close(Math.Exp(-740), TrainingMath.Exp(-740), 1e-9, "exp(-740)");
        Assert.True(double.IsNaN(TrainingMath.Exp(double.NaN)));
    }

    [Fact]
    public void Log_agrees_with_the_C_library()
    {
        var rng = new SplitMix64(4);
        for (int k = 0; k < 200000; k++)
        {
            double x = Math.ScaleB(0.5 + rng.NextDouble(), rng.NextBelow(400) - 200);
            double expected = Math.Log(x);
            // Near x = 1 the result is small; compare absolutely there.
            Assert.True(Math.Abs(TrainingMath.Log(x) - expected) <= 4e-16 * Math.Max(1.0, Math.Abs(expected)), $"log({x:R})");
        }
        Assert.Equal(0.0, TrainingMath.Log(1.0));
        Close(Math.Log(2), TrainingMath.Log(2.0), 2e-16, "log 2");
        Close(Math.Log(1e-300), TrainingMath.Log(1e-300), 2e-16, "log 1e-300");
        Assert.Throws<ArgumentOutOfRangeException>(() => TrainingMath.Log(0.0));
        Assert.Throws<ArgumentOutOfRangeException>(() => TrainingMath.Log(-1.0));
    }

    // The logistic function: sigma(0) = 1/2, sigma(-x) = 1 - sigma(x), and 1/(1 + e^-x) from the C library.
    [Fact]
    public void Sigmoid_is_the_logistic_function()
    {
        Assert.Equal(0.5, TrainingMath.Sigmoid(0));
        for (double x = -30; x <= 30; x += 0.37)
        {
            Close(1.0 / (1.0 + Math.Exp(-x)), TrainingMath.Sigmoid(x), 1e-15, $"sigmoid({x})");
            Assert.True(Math.Abs(TrainingMath.Sigmoid(-x) - (1 - TrainingMath.Sigmoid(x))) <= 2e-16, $"symmetry at {x}");
        }
        Assert.Equal(1.0, TrainingMath.Sigmoid(800));
        Assert.Equal(0.0, TrainingMath.Sigmoid(-800));
    }

    // The span form must give exactly the scalar form's bits (the trainer's models may not depend on the vector
    // width), and so the same accuracy against the C library's exp.
    [Fact]
    public void Span_sigmoid_is_bit_for_bit_the_scalar_sigmoid()
    {
        var rng = new SplitMix64(21);
        var x = new List<double>();
        for (int k = 0; k < 100000; k++) x.Add((2 * rng.NextDouble() - 1) * (k % 3 == 0 ? 40 : 800));
        // The edges: both signs of zero, the subnormal-scaling boundary near -708, beyond the underflow, NaN.
        x.AddRange([0.0, -0.0, 708.0, -708.0, 708.1, -708.1, 707.9, -707.9, 745.2, -745.2, 1e-300, -1e-300,
            double.MaxValue, double.MinValue, double.PositiveInfinity, double.NegativeInfinity, double.NaN, 3.0]);
        var input = x.ToArray();
        var output = new double[input.Length];
        // Every start offset and length, so the vector loop and the scalar tail both meet every value.
        for (int start = 0; start < 4; start++)
        {
            TrainingMath.Sigmoid(input.AsSpan(start), output.AsSpan(start));
            for (int k = start; k < input.Length; k++)
            {
                double expected = TrainingMath.Sigmoid(input[k]);
                Assert.True(BitConverter.DoubleToInt64Bits(expected) == BitConverter.DoubleToInt64Bits(output[k])
                    || (double.IsNaN(expected) && double.IsNaN(output[k])), $"sigmoid({input[k]:R}) at offset {start}");
            }
        }
        // Every short length: the sixteen-, eight- and four-lane loops and the scalar tail each meet the start and the
        // end of a span.
        for (int n = 0; n <= 40; n++)
        {
            var shortOut = new double[n];
            TrainingMath.Sigmoid(input.AsSpan(0, n), shortOut);
            for (int k = 0; k < n; k++)
                Assert.Equal(BitConverter.DoubleToInt64Bits(TrainingMath.Sigmoid(input[k])),
                    BitConverter.DoubleToInt64Bits(shortOut[k]));
        }
        var same = (double[])input.Clone();
        TrainingMath.Sigmoid(same, same); // in place
        Assert.Equal(output.Skip(3), same.Skip(3));
        for (int k = 0; k < 30000; k++)
            if (Math.Abs(input[k]) < 700)
                Close(1.0 / (1.0 + Math.Exp(-input[k])), output[k], 1e-15, $"sigmoid({input[k]:R})");
    }
}
