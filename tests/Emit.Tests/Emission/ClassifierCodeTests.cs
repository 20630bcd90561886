using System.Globalization;
using Emit.Analysis;
using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Tests.Reference;

namespace Emit.Tests.Emission;

/// <summary>
/// The generated classifier (<c>compile MODEL1 MODEL2 MODEL3 --priors ...</c>) in C and C#, f32 and fixed, over every
/// input of three small models, against an exact Bayes computation made here from enumeration (<see cref="BruteForce"/>:
/// F_k(v) and log Z_k summed over every joint state) and against emit classify's <see cref="BayesClassifier"/>: every
/// score within the stated bound, the index equal to Bayes' choice wherever the exact top two differ by more than twice
/// the bound; in fixed mode every score is bit for bit the offset minus the integer simulator's free energy.
/// </summary>
public sealed class ClassifierCodeTests
{
    private const int Visible = 10;
    private static readonly double[] Priors = [0.5, 0.3, 0.2];

    private static BoltzmannModel[] Models() =>
    [
        .. new[] { (ModelKind.Rbm, 11), (ModelKind.Lateral, 12), (ModelKind.Rbm, 13) }.Select(x =>
        {
            var m = TestModels.Random(x.Item1, Visible, 4, seed: x.Item2, scale: 0.9);
            return m.With(null, new LogPartition(BruteForce.LogPartition(m), "exact", 0));
        }),
    ];

    /// <summary>Exact scores from enumeration: −F_k(v) − log Z_k + log π_k, π normalised.</summary>
    private static double[][] ExactScores(BoltzmannModel[] models)
    {
        double total = Priors.Sum();
        var logZ = models.Select(BruteForce.LogPartition).ToArray();
        return Enumerable.Range(0, 1 << Visible).Select(v =>
        {
            var units = TestModels.Bits(v, Visible);
            return models.Select((m, k) => -BruteForce.FreeEnergy(m, units) - logZ[k] + Math.Log(Priors[k] / total))
                .ToArray();
        }).ToArray();
    }

    private static string CDriver(string name, bool isFixed) => $$"""
        #include <stdio.h>
        #include "{{name}}.h"
        int main(void)
        {
            unsigned v, k;
            for (v = 0u; v < (1u << {{Visible}}); ++v) {
                uint8_t packed[{{Naming.MacroPrefix(name)}}_PACKED_BYTES] = { (uint8_t)(v & 0xFFu), (uint8_t)(v >> 8) };
                {{name}}_energy_t scores[{{Naming.MacroPrefix(name)}}_MODELS];
                unsigned best = {{name}}_classify(packed, scores);
                printf("%u", best);
                for (k = 0u; k < {{Naming.MacroPrefix(name)}}_MODELS; ++k) printf({{(isFixed ? "\" %ld\", (long)scores[k]" : "\" %.9g\", (double)scores[k]")}});
                printf("\n");
            }
            return 0;
        }
        """;

    private static string CSharpDriver(string cls, string type) => $$"""
        internal static class Program
        {
            public static void Main()
            {
                var inv = global::System.Globalization.CultureInfo.InvariantCulture;
                var text = new global::System.Text.StringBuilder();
                var scores = new {{type}}[{{cls}}.Models];
                for (int v = 0; v < (1 << {{Visible}}); v++)
                {
                    var packed = new byte[] { (byte)(v & 0xFF), (byte)(v >> 8) };
                    text.Append({{cls}}.Classify(packed, scores).ToString(inv));
                    foreach (var s in scores) text.Append(' ').Append(s.ToString(inv));
                    text.Append('\n');
                }
                global::System.Console.Out.Write(text.ToString());
            }
        }
        """;

    private static List<(int Index, double[] Scores)> Parse(string output) =>
        output.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l =>
        {
            var w = l.Split(' ');
            return (int.Parse(w[0], CultureInfo.InvariantCulture),
                w.Skip(1).Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray());
        }).ToList();

    private static void Check(CompiledClassifier compiled, BoltzmannModel[] models, List<(int Index, double[] Scores)> rows)
    {
        var plan = compiled.Plan;
        var exact = ExactScores(models);
        bool isFixed = plan.OffsetUnits.Count > 0;
        double scale = isFixed ? Math.ScaleB(1.0, plan.EnergyFractionBits) : 1.0;
        var sims = isFixed ? plan.Models.Select(p => new FixedPointSimulator(((FixedScorerPlan)p).Fixed)).ToArray() : null;
        // emit classify's reference: posteriors over the same inputs
        var bayes = new BayesClassifier(models, ["a", "b", "c"], Priors);
        var units = new byte[(1 << Visible) * Visible];
        for (int v = 0; v < 1 << Visible; v++) TestModels.Bits(v, Visible).CopyTo(units, v * Visible);
        var posterior = new double[(1 << Visible) * 3];
        bayes.Posteriors(units, 1 << Visible, posterior);
        Assert.Equal(1 << Visible, rows.Count);
        int decided = 0;
        for (int v = 0; v < rows.Count; v++)
        {
            var (index, scores) = rows[v];
            for (int k = 0; k < 3; k++)
            {
                Assert.True(Math.Abs(scores[k] / scale - exact[v][k]) <= plan.ScoreBound,
                    $"v {v} model {k}: {scores[k] / scale} vs exact {exact[v][k]}, bound {plan.ScoreBound}");
                if (sims is not null)
                    Assert.Equal(plan.OffsetUnits[k] - sims[k].FreeEnergy(TestModels.Bits(v, Visible)), (long)scores[k]);
            }
            var order = exact[v].Select((s, k) => (s, k)).OrderByDescending(x => x.s).ToArray();
            if (order[0].s - order[1].s > 2 * plan.ScoreBound)
            {
                decided++;
                Assert.Equal(order[0].k, index);
                int bayesBest = Enumerable.Range(0, 3).MaxBy(k => posterior[v * 3 + k]);
                Assert.Equal(order[0].k, bayesBest);
            }
            // the lowest index among the largest scores
            Assert.Equal(Enumerable.Range(0, 3).First(k => scores[k] == scores.Max()), index);
        }
        Assert.True(decided > 900, $"only {decided} inputs had a clear winner");
    }

    [SkippableTheory]
    [InlineData(NumericMode.F32)]
    [InlineData(NumericMode.Fixed)]
    public void C_classifier_scores_within_the_bound_and_picks_Bayes_choice(NumericMode mode)
    {
        var gcc = Toolchain.Require("gcc");
        var dir = Toolchain.TempDir("classify-c");
        var models = Models();
        var compiled = ClassifierCompiler.Build(models, ["a.json", "b.json", "c.json"], Priors,
            new CompileOptions(["c"], mode, "modes"));
        OutputFolder.Write(dir, compiled.AllFiles, force: true);
        File.WriteAllText(Path.Combine(dir, "driver.c"), CDriver("modes", mode == NumericMode.Fixed));
        var exe = Path.Combine(dir, "driver");
        Toolchain.RunOk(gcc, [.. Toolchain.Split(Toolchain.StrictC), "-I", dir, Path.Combine(dir, "driver.c"),
            Path.Combine(dir, "modes.c"), Path.Combine(dir, "modes_1.c"), Path.Combine(dir, "modes_2.c"),
            Path.Combine(dir, "modes_3.c"), "-lm", "-o", exe]);
        Check(compiled, models, Parse(Toolchain.RunOk(exe, [])));
    }

    [SkippableTheory]
    [InlineData(NumericMode.F32)]
    [InlineData(NumericMode.Fixed)]
    public void CSharp_classifier_scores_within_the_bound_and_picks_Bayes_choice(NumericMode mode)
    {
        var dotnet = Toolchain.Require("dotnet");
        var dir = Toolchain.TempDir("classify-cs");
        var models = Models();
        var compiled = ClassifierCompiler.Build(models, ["a.json", "b.json", "c.json"], Priors,
            new CompileOptions(["csharp"], mode, "modes"));
        var type = compiled.Plan.Models[0] is FixedScorerPlan f
            ? (f.Accumulator == AccumulatorType.Int32 ? "int" : "long") : "float";
        var sources = compiled.AllFiles.Where(g => g.FileName.EndsWith(".cs", StringComparison.Ordinal))
            .Select(g => new KeyValuePair<string, string>(g.FileName, g.Text))
            .Append(new("Program.cs", CSharpDriver("global::Emit.Generated.Modes", type)));
        var dll = CSharpProject.Build(dir, sources, new CSharpProject.Settings(WarningsAsErrors: true), Toolchain.Limit,
            out var failure);
        Assert.True(dll is not null, failure);
        Check(compiled, models, Parse(Toolchain.RunOk(dotnet, [dll])));
    }

    [SkippableFact]
    public void C_posteriors_agree_with_emit_classify_within_the_bound()
    {
        var gcc = Toolchain.Require("gcc");
        var dir = Toolchain.TempDir("classify-post");
        var models = Models();
        var compiled = ClassifierCompiler.Build(models, ["a.json", "b.json", "c.json"], Priors,
            new CompileOptions(["c"], NumericMode.F32, "modes"));
        OutputFolder.Write(dir, compiled.AllFiles, force: true);
        File.WriteAllText(Path.Combine(dir, "driver.c"), $$"""
            #include <stdio.h>
            #include "modes.h"
            int main(void)
            {
                unsigned v, k;
                for (v = 0u; v < (1u << {{Visible}}); ++v) {
                    uint8_t packed[MODES_PACKED_BYTES] = { (uint8_t)(v & 0xFFu), (uint8_t)(v >> 8) };
                    modes_energy_t scores[MODES_MODELS], p[MODES_MODELS];
                    (void)modes_classify(packed, scores);
                    modes_posteriors(scores, p);
                    for (k = 0u; k < MODES_MODELS; ++k) printf(k == 0u ? "%.9g" : " %.9g", (double)p[k]);
                    printf("\n");
                }
                return 0;
            }
            """);
        var exe = Path.Combine(dir, "driver");
        Toolchain.RunOk(gcc, [.. Toolchain.Split(Toolchain.StrictC), "-I", dir, Path.Combine(dir, "driver.c"),
            .. Enumerable.Range(0, 4).Select(k => Path.Combine(dir, k == 0 ? "modes.c" : $"modes_{k}.c")), "-lm", "-o", exe]);
        var lines = Toolchain.RunOk(exe, []).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        // emit classify's posteriors (BayesClassifier); each generated score is within δ of the exact one, so each
        // posterior is within a factor e^(±2δ) of the exact one, plus f32 rounding of exp and the sum
        var bayes = new BayesClassifier(models, ["a", "b", "c"], Priors);
        var units = new byte[(1 << Visible) * Visible];
        for (int v = 0; v < 1 << Visible; v++) TestModels.Bits(v, Visible).CopyTo(units, v * Visible);
        var posterior = new double[(1 << Visible) * 3];
        bayes.Posteriors(units, 1 << Visible, posterior);
        double factor = Math.Exp(2 * compiled.Plan.ScoreBound) - 1;
        for (int v = 0; v < 1 << Visible; v++)
        {
            var p = lines[v].Split(' ').Select(x => double.Parse(x, CultureInfo.InvariantCulture)).ToArray();
            for (int k = 0; k < 3; k++)
                Assert.True(Math.Abs(p[k] - posterior[v * 3 + k]) <= posterior[v * 3 + k] * factor + 1e-6,
                    $"v {v} class {k}: {p[k]} vs {posterior[v * 3 + k]}");
        }
    }
}
