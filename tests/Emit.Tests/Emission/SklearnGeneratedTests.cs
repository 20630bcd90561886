using Emit.Emission;
using Emit.Quantize;
using Emit.Model;
using Emit.Tests.Model;
using Emit.Vectors;

namespace Emit.Tests.Emission;

/// <summary>
/// Generated C for a model trained by scikit-learn against scikit-learn's own free energy
/// (BernoulliRBM._free_energy, Debian python3-sklearn 1.2.1; fixture made by tests/reference/make_fixtures.py).
/// </summary>
public sealed class SklearnGeneratedTests
{
    [SkippableTheory]
    [InlineData(NumericMode.F64)]
    [InlineData(NumericMode.F32)]
    public void Generated_c_matches_scikit_learn_free_energy(NumericMode mode)
    {
        var model = ModelLoader.Load(NpzFixtures.Path("sklearn_digits_rbm.npz"));
        var expected = NpzFixtures.FreeEnergies("sklearn_digits_free_energy.csv");
        var vectors = new List<byte[]>();
        using (var reader = VectorReader.Open(NpzFixtures.Path("sklearn_digits_vectors.csv"), model.Visible))
        {
            var units = new byte[reader.Width];
            while (reader.TryRead(units)) vectors.Add((byte[])units.Clone());
        }
        Assert.Equal(expected.Length, vectors.Count);

        var dir = Toolchain.TempDir("sklearn");
        var name = "digits_" + mode.ToText();
        foreach (var f in ScorerCompiler.Build(model, "sklearn_digits_rbm.npz", new CompileOptions(["c"], mode, name)).AllFiles)
            File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        var result = CHarness.Run(CHarness.Build(dir, name, model.Threshold.HasValue), vectors);
        Assert.Equal(0, result.SelfTestFailures);
        double rel = GeneratedCTests.RelativeTolerance(mode);
        for (int k = 0; k < vectors.Count; k++)
            Assert.True(Math.Abs(result.Rows[k].Energy - expected[k]) <= rel * Math.Max(1.0, Math.Abs(expected[k])),
                $"row {k}: generated {result.Rows[k].Energy:R}, scikit-learn {expected[k]:R}");
    }
}
