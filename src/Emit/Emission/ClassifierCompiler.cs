using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// Several models of the same units → a classifier (docs/generated-code.md, "Classifier"): one scorer per model,
/// compiled as <see cref="ScorerCompiler"/> compiles it under the name <c>NAME_k</c> (with its own manifest), and the
/// classifier files <c>NAME.h</c>/<c>NAME.c</c> or <c>NAME.cs</c> that combine them. In fixed mode the models are
/// planned with one accumulator type and one energy format: the coarsest E any model needs, lowered further until
/// each score −F_k + c_k provably fits the accumulator.
/// </summary>
public static class ClassifierCompiler
{
    /// <summary>Compiles a classifier; <paramref name="labels"/> are the models' file names (no folders).</summary>
    public static CompiledClassifier Build(IReadOnlyList<BoltzmannModel> models, IReadOnlyList<string> labels,
        IReadOnlyList<double>? priors, CompileOptions options)
    {
        Naming.CheckScorerName(options.Name);
        Check(models, labels, priors, options);
        var logPriors = Analysis.BayesClassifier.LogPriors(models.Count, priors);
        var scorers = options.Numeric == NumericMode.Fixed
            ? FixedScorers(models, labels, logPriors, options)
            : models.Select((m, k) => ScorerCompiler.Build(m, labels[k], Component(options, k, null))).ToArray();
        var plan = new ClassifierPlan(options, scorers.Select(s => s.Plan).ToArray(), logPriors);
        var templates = new TemplateRenderer(options.TemplatesDirectory);
        var files = options.Targets.Distinct()
            .SelectMany(t => ClassifierEmitter.Emit(t, plan, templates).Select(f => (t, f))).ToArray();
        return new CompiledClassifier(plan, scorers, priors, files,
            ScorerCompiler.TemplatesRead(files.Select(f => f.f)));
    }

    /// <summary>The options of model k's scorer: the classifier's, named NAME_k, with the fixed options given.
    /// </summary>
    private static CompileOptions Component(CompileOptions options, int k, FixedPointOptions? fixedOptions) =>
        options with
        {
            Name = options.Name + "_" + (k + 1).ToString(System.Globalization.CultureInfo.InvariantCulture),
            Fixed = fixedOptions ?? options.Fixed,
        };

    private static void Check(IReadOnlyList<BoltzmannModel> models, IReadOnlyList<string> labels,
        IReadOnlyList<double>? priors, CompileOptions options)
    {
        if (models.Count < 2)
            throw new EmitException("a classifier needs at least two models", "give one model per class");
        if (options.AlarmFilter is not null)
            throw new EmitException("the alarm filter votes on one model's decisions, not on a classifier's",
                "compile the alarm filter with a single model");
        if (options.Stream || options.Explain)
            throw new EmitException("streamed scoring and explanations are for one model, not a classifier",
                "compile each model on its own with them");
        Analysis.BayesClassifier.CheckModels(models, labels, priors);
        for (int k = 1; k < models.Count; k++)
            if (!models[k].Names.SequenceEqual(models[0].Names))
                throw new EmitException($"{labels[k]} names its units differently from {labels[0]}",
                    "every model of a classifier must describe the same units, with the same names in the same order",
                    labels[k]);
    }

    /// <summary>Fixed mode: every model with one accumulator type and one energy format E.</summary>
    private static CompiledScorer[] FixedScorers(IReadOnlyList<BoltzmannModel> models, IReadOnlyList<string> labels,
        IReadOnlyList<double> logPriors, CompileOptions options)
    {
        var given = options.FixedOptions;
        var free = models.Select(m => FixedPointPlanner.Build(m, given)).ToArray();
        var acc = given.Accumulator
                  ?? (free.Any(p => p.Accumulator == AccumulatorType.Int64)
                      ? AccumulatorType.Int64
                      : AccumulatorType.Int32);
        int e = free.Min(p => p.EnergyFractionBits);
        while (true)
        {
            var fixedOptions = given with { Accumulator = acc, EnergyFractionBitsLimit = e };
            var scorers = models
                .Select((m, k) => ScorerCompiler.Build(m, labels[k], Component(options, k, fixedOptions)))
                .ToArray();
            var plans = scorers.Select(s => (FixedScorerPlan)s.Plan).ToArray();
            int lowest = plans.Min(p => p.EnergyFractionBits);
            bool fits = plans.Select((p, k) =>
            {
                double offset = logPriors[k] - models[k].LogPartition!.Value;
                long c = (long)FixedRounding.Quantize(offset, p.EnergyFractionBits);
                return Math.Max(Math.Abs(p.ResultMin), Math.Abs(p.ResultMax)) <= p.AccumulatorMax - Math.Abs(c);
            }).All(x => x);
            if (lowest == e && plans.All(p => p.EnergyFractionBits == e) && fits) return scorers;
            if (lowest < e) e = lowest;
            else if (e == 0)
                throw new EmitException(
                    "no common energy format keeps every classifier score (−F + log prior − log Z) within " +
                    acc.ToText(),
                    acc == AccumulatorType.Int32
                        ? $"use {Setting.Accumulator.Ref()} int64"
                        : "the models' log Z are too large for fixed point");
            else e--;
        }
    }
}
