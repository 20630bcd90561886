using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Tests.Model;

/// <summary>
/// The reference scorer, reached through the .npz import and the vector reader, against scikit-learn's own
/// BernoulliRBM._free_energy (Debian python3-sklearn 1.2.1, trained on sklearn's bundled digits data by
/// tests/reference/make_fixtures.py; versions in Fixtures/reference_versions.json).
/// </summary>
public sealed class SklearnFreeEnergyTests
{
    /// <summary>Relative agreement required with the outside library.</summary>
    private const double RelativeTolerance = 1e-10;

    [Theory]
    // scikit-learn's BernoulliRBM._free_energy on its own fitted model, saved with np.savez(components_=..., ...).
    [InlineData("sklearn_digits_rbm.npz", "sklearn_digits_free_energy.csv")]
    // The same model as float32, big-endian, Fortran order (weights/visible_bias/hidden_bias), scored by numpy
    // in float64 from the float32 values: -v.b - sum(np.logaddexp(0, v @ W + c)).
    [InlineData("digits_native_f4_be_fortran.npz", "digits_native_f4_be_fortran_free_energy.csv")]
    public void Free_energy_matches_the_outside_library(string model, string expectedFile)
    {
        var scorer = new ReferenceScorer(ModelLoader.Load(NpzFixtures.Path(model)));
        var expected = NpzFixtures.FreeEnergies(expectedFile);
        using var vectors = VectorReader.Open(NpzFixtures.Path("sklearn_digits_vectors.csv"), scorer.Model.Visible);
        var units = new byte[vectors.Width];
        int row = 0;
        while (vectors.TryRead(units))
        {
            double f = scorer.FreeEnergy(units);
            double relative = Math.Abs(f - expected[row]) / Math.Max(Math.Abs(expected[row]), 1e-300);
            Assert.True(relative <= RelativeTolerance,
                $"row {row} (line {vectors.LastLine}): emit {f:R}, outside reference {expected[row]:R}, relative difference {relative:E2}");
            row++;
        }
        Assert.Equal(expected.Length, row);
        Assert.Equal(200, row);
    }
}
