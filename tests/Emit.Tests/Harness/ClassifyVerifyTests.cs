using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Tests.Emission;
using Emit.Tests.Reference;

namespace Emit.Tests.Harness;

/// <summary>
/// emit verify with several models: the generated classifier runs beside model 1's scorer on the three targets, and
/// its indices and scores are checked against the reference (<see cref="ClassifyCheck"/>); the reference's scores are
/// themselves checked here against log Z from enumeration (<see cref="BruteForce"/>). A wrong index or score fails.
/// </summary>
public sealed class ClassifyVerifyTests
{
    private const int Visible = 10;

    private static BoltzmannModel[] Models() =>
    [
        .. new[] { 21, 22, 23 }.Select(seed =>
        {
            var m = TestModels.Random(ModelKind.Rbm, Visible, 4, seed, scale: 1.0);
            return m.With(null, new LogPartition(BruteForce.LogPartition(m), "exact", 0));
        }),
    ];

    [SkippableTheory]
    [InlineData(NumericMode.F32)]
    [InlineData(NumericMode.Fixed)]
    public void The_classifier_passes_on_every_target(NumericMode mode)
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var models = Models();
        var dir = Toolchain.TempDir("classify-verify");
        var input = VerifyCases.WriteVectors(dir, Enumerable.Range(0, 1 << Visible).Select(v => TestModels.Bits(v, Visible)));
        var report = Verifier.Run(new VerifyRequest
        {
            Model = models[0],
            ModelLabel = "idle.json",
            MoreModels = [(models[1], "defrost.json"), (models[2], "fault.json")],
            Priors = [0.6, 0.3, 0.1],
            InputPath = input,
            Targets = ["c", "csharp", "cortex-m3"],
            Numeric = mode,
            Settings = VerifyCases.Settings(imageInputs: 512),
            BatchRows = 300,
        });
        Assert.True(report.Passed, VerifyCases.Describe(report));
        foreach (var t in report.Targets)
        {
            var f = Assert.Single(t.Features);
            Assert.Equal("classify", f.Feature);
            Assert.Equal(1 << Visible, f.Checks);
            Assert.Equal(0, f.Mismatches);
        }
    }

    [Fact]
    public void A_wrong_index_or_score_fails()
    {
        var models = Models();
        var compiled = ClassifierCompiler.Build(models, ["a", "b", "c"], null,
            new CompileOptions(["c"], NumericMode.F64, "modes"));
        var plan = compiled.Plan;
        var check = new ClassifyCheck(plan, NumericExpectation.For(models[0], NumericMode.F64, null));
        var ok = new ClassifyCheck(plan, NumericExpectation.For(models[0], NumericMode.F64, null));
        var scorers = models.Select(m => new Emit.Reference.ReferenceScorer(m)).ToArray();
        int wrong = 0;
        for (int v = 0; v < 1 << Visible; v++)
        {
            var units = TestModels.Bits(v, Visible);
            var scores = scorers.Select((s, k) => plan.Offsets[k] - s.FreeEnergy(units)).ToArray();
            int best = Array.IndexOf(scores, scores.Max());
            string Hex(double x) => BitConverter.DoubleToUInt64Bits(x).ToString("x16", System.Globalization.CultureInfo.InvariantCulture);
            string Group(int index) => "classify:" + index + "," + string.Join(",", scores.Select(Hex));
            ok.Add(v, units, new ScoredRow(0, true, -1, Group(best)));
            check.Add(v, units, new ScoredRow(0, true, -1, Group((best + 1) % 3)));
            wrong++;
        }
        Assert.True(ok.Finish().Passed);
        var result = check.Finish();
        Assert.False(result.Passed);
        Assert.True(result.Mismatches > wrong / 2, $"{result.Mismatches} of {wrong}");
        Assert.Contains("the reference's clear choice is", result.Failures[0]);
    }
}
