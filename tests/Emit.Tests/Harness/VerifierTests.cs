using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;
using Emit.Tests.Emission;
using Emit.Tests.Model;

namespace Emit.Tests.Harness;

/// <summary>
/// Verify on every target against the double-precision reference scorer, whose free energy the reference tests check
/// against brute-force enumeration and against scikit-learn (BernoulliRBM._free_energy, Debian python3-sklearn 1.2.1).
/// </summary>
public sealed class VerifierTests
{
    /// <summary>
    /// A model trained by scikit-learn on its digits data, scored on 200 rows scikit-learn also scored
    /// (tests/reference/make_fixtures.py): the generated code passes on the host, in .NET and on the emulated Cortex-M3.
    /// </summary>
    [SkippableTheory]
    [InlineData(NumericMode.F64)]
    [InlineData(NumericMode.F32)]
    public void Scikit_learn_digits_model_passes_on_every_target(NumericMode mode)
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var model = ModelLoader.Load(NpzFixtures.Path("sklearn_digits_rbm.npz"));
        var report = Verifier.Run(new VerifyRequest
        {
            Model = model,
            ModelLabel = "sklearn_digits_rbm.npz",
            InputPath = NpzFixtures.Path("sklearn_digits_vectors.csv"),
            Targets = ["c", "csharp", "cortex-m3"],
            Numeric = mode,
            Settings = VerifyCases.Settings(),
            BatchRows = 64,     // several batches through every harness process
        });
        Assert.True(report.Passed, VerifyCases.Describe(report));
        Assert.Equal(200, report.Vectors);
        Assert.Equal(["c", "csharp", "cortex-m3"], report.Targets.Select(t => t.Target));
        foreach (var t in report.Targets)
        {
            Assert.Equal(200, t.Vectors);
            Assert.Equal(mode.ToText(), t.Numeric);
            Assert.True(t.MaxAbsError <= t.ErrorBound);
            Assert.True(t.MeanAbsError <= t.MaxAbsError);
            Assert.Equal(0, t.SelfTestFailures);
            Assert.Equal(0, t.EntryPointMismatches);
            Assert.Null(t.BitExact);
            Assert.True(t.ModelHashMatches);
            Assert.Equal(200, t.Histogram.Total);
        }

        // scikit-learn's own free energies, read from the fixture: by the triangle inequality every generated result is
        // within (reported max error + the reference's distance from scikit-learn) of scikit-learn's, and that is within
        // the mode's tolerance (1e-9 relative for f64, 1e-4 for f32)
        var sklearn = NpzFixtures.FreeEnergies("sklearn_digits_free_energy.csv");
        var scorer = new ReferenceScorer(model);
        using var reader = Emit.Vectors.VectorReader.Open(NpzFixtures.Path("sklearn_digits_vectors.csv"), model.Visible);
        var units = new byte[model.Visible];
        double worst = 0;
        for (int k = 0; reader.TryRead(units); k++) worst = Math.Max(worst, Math.Abs(scorer.FreeEnergy(units) - sklearn[k]));
        foreach (var t in report.Targets)
            Assert.True(t.MaxAbsError!.Value + worst <= GeneratedCTests.RelativeTolerance(mode) * Math.Max(1, sklearn.Max(Math.Abs)),
                $"{t.Target}: {t.MaxAbsError:R} against the reference, which is {worst:R} from scikit-learn");
    }

    /// <summary>
    /// Fixed point: every target's integers equal the library's integer simulator on the scikit-learn digits model, and
    /// the error stays within the proved bound, for each weight width (int8 without the slow .NET build; the CLI tests
    /// cover int8 in C#).
    /// </summary>
    [SkippableTheory]
    [InlineData(WeightType.Int16, "c,csharp,cortex-m3")]
    [InlineData(WeightType.Int8, "c,cortex-m3")]
    public void Fixed_point_is_bit_exact_on_every_target(WeightType weights, string targets)
    {
        var names = targets.Split(',');
        VerifyCases.Require(names);
        var model = ModelLoader.Load(NpzFixtures.Path("sklearn_digits_rbm.npz"));
        var report = Verifier.Run(new VerifyRequest
        {
            Model = model,
            ModelLabel = "sklearn_digits_rbm.npz",
            InputPath = NpzFixtures.Path("sklearn_digits_vectors.csv"),
            Targets = names,
            Numeric = NumericMode.Fixed,
            Fixed = new FixedPointOptions(weights),
            Settings = VerifyCases.Settings(),
            BatchRows = 64,
        });
        Assert.True(report.Passed, VerifyCases.Describe(report));
        var plan = FixedPointPlanner.Build(model, new FixedPointOptions(weights));
        foreach (var t in report.Targets)
        {
            Assert.Equal(200, t.Vectors);
            Assert.Equal("fixed", t.Numeric);
            Assert.Equal(weights.ToText(), t.Weights);
            Assert.True(t.BitExact);
            Assert.Equal(0, t.BitMismatches);
            Assert.Equal(plan.ErrorBound + FloatErrorBound.ReferenceWorst(model), t.ErrorBound);
            Assert.True(t.MaxAbsError <= t.ErrorBound);
            Assert.Equal(0, t.SelfTestFailures);
        }
    }

    public static TheoryData<string, NumericMode> KindCases()
    {
        var data = new TheoryData<string, NumericMode>();
        foreach (var id in new[] { "lat_a", "gen_a" })
            foreach (var mode in new[] { NumericMode.F64, NumericMode.F32, NumericMode.Fixed })
                data.Add(id, mode);
        return data;
    }

    /// <summary>
    /// Lateral (with a threshold) and general models on the host and the emulator, over the generated test vectors
    /// (extremes, per-unit maximisers, samples, pairs across the threshold), with small emulator images so the vectors
    /// arrive in several images.
    /// </summary>
    [SkippableTheory]
    [MemberData(nameof(KindCases))]
    public void Lateral_and_general_models_pass_on_the_host_and_the_emulator(string id, NumericMode mode)
    {
        VerifyCases.Require("c", "cortex-m3");
        var c = CodegenCases.All.Single(x => x.Id == id);
        var dir = Toolchain.TempDir("verify-" + id);
        var vectors = TestVectorSet.Generate(c.Model, new TestVectorOptions(40, Seed: 7)).Select(v => v.Units).ToList();
        var report = Verifier.Run(new VerifyRequest
        {
            Model = c.Model,
            ModelLabel = id + ".json",
            InputPath = VerifyCases.WriteVectors(dir, vectors),
            Targets = ["c", "cortex-m3"],
            Numeric = mode,
            Settings = VerifyCases.Settings(imageInputs: 16),
            BatchRows = 15,
        });
        Assert.True(report.Passed, VerifyCases.Describe(report));
        Assert.All(report.Targets, t => Assert.Equal(vectors.Count, t.Vectors));
        if (c.Model.Threshold is not null)
            Assert.All(report.Targets, t => Assert.Equal(0, t.UnexplainedMismatches));
    }
}
