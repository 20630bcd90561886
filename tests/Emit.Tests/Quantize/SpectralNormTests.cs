using Emit.Quantize;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.LinearAlgebra.Factorization;

namespace Emit.Tests.Quantize;

public sealed class SpectralNormTests
{
    /// <summary>The guaranteed upper bound against MathNet's SVD-based induced 2-norm (an outside implementation).</summary>
    [Theory]
    [InlineData(50, 20, 1)]
    [InlineData(20, 50, 2)]
    [InlineData(200, 60, 3)]
    [InlineData(1, 7, 4)]
    [InlineData(9, 1, 5)]
    public void Upper_bound_is_above_and_close_to_the_largest_singular_value(int rows, int cols, int seed)
    {
        var rng = new Random(seed);
        var a = new double[rows * cols];
        for (int k = 0; k < a.Length; k++) a[k] = rng.NextDouble() - 0.5;
        double exact = Matrix<double>.Build.DenseOfRowMajor(rows, cols, a).L2Norm();
        double bound = SpectralNorm.UpperBound(a, rows, cols);
        Assert.True(bound >= exact, $"bound {bound} below ‖A‖₂ = {exact}");
        Assert.True(bound <= exact * (1 + 1e-4), $"bound {bound} loose against ‖A‖₂ = {exact}");
    }

    [Fact]
    public void Zero_matrix_has_norm_zero() => Assert.Equal(0, SpectralNorm.UpperBound(new double[12], 3, 4));

    [Fact]
    public void A_wide_matrix_is_bounded_through_its_small_gram_matrix()
    {
        // 4 × 65536: the old AᵀA was 65536² entries, an int size that wraps to 0. ‖A‖₂² = λ_max(AAᵀ), taken here from
        // MathNet's symmetric eigenvalue decomposition of the 4×4 Gram matrix (an outside implementation).
        const int rows = 4, cols = 1 << 16;
        var rng = new Random(7);
        var a = new double[rows * cols];
        for (int k = 0; k < a.Length; k++) a[k] = (rng.NextDouble() - 0.5) * (1 + k / cols);   // rows of distinct scale
        var m = Matrix<double>.Build.DenseOfRowMajor(rows, cols, a);
        double exact = Math.Sqrt((m * m.Transpose()).Evd(Symmetricity.Symmetric).EigenValues.Real().Maximum());
        double bound = SpectralNorm.UpperBound(a, rows, cols);
        Assert.True(bound >= exact * (1 - 1e-12), $"bound {bound} below ‖A‖₂ = {exact}");
        Assert.True(bound <= exact * (1 + 1e-4), $"bound {bound} loose against ‖A‖₂ = {exact}");
    }

    [Fact]
    public void Above_the_order_limit_the_bound_is_infinite_and_costs_nothing()
    {
        int n = SpectralNorm.MaxOrder + 1;
        Assert.Equal(double.PositiveInfinity, SpectralNorm.UpperBound(new double[n * n], n, n));
    }
}
