using System.Globalization;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// A classifier over several models of the same units (<c>emit compile MODEL1 MODEL2 ... --name NAME</c>): one scorer
/// per model (<see cref="Models"/>, named <c>NAME_1</c>, <c>NAME_2</c>, ...) and the constants that turn their free
/// energies into scores[k] = −F_k(v) − log Z_k + log π_k (π normalised to sum to 1): the log of the joint
/// probability of class k and input v, whose argmax is Bayes' choice. In fixed mode every model has the same energy
/// format and the
/// constants are integers of it; <see cref="ScoreBound"/> bounds |score − exact score| (docs/fixed-point.md §9).
/// </summary>
public sealed class ClassifierPlan
{
    internal ClassifierPlan(CompileOptions options, IReadOnlyList<ScorerPlan> models, IReadOnlyList<double> logPriors)
    {
        Options = options;
        Models = models;
        LogPriors = logPriors;
        var inv = CultureInfo.InvariantCulture;
        LogZ = models.Select(m => m.Model.LogPartition!.Value).ToArray();
        Offsets = models.Select((_, k) => logPriors[k] - LogZ[k]).ToArray();
        if (models[0] is FixedScorerPlan f0)
        {
            EnergyFractionBits = f0.EnergyFractionBits;
            OffsetUnits = Offsets.Select(c => (long)FixedRounding.Quantize(c, f0.EnergyFractionBits)).ToArray();
            // each offset is rounded to the nearest multiple of 2^-E: half an LSB more than the scorer's bound
            ScoreBound = models.Max(m => m.ErrorBound) + Math.ScaleB(0.5, -f0.EnergyFractionBits);
        }
        else
        {
            // float: fl(c_k) is within u·|c_k| of c_k, and the sum fl(fl(c_k) − F) within u·|fl(c_k) − F| of it,
            // where |F| is at most the sum of |parameter| plus hidden·log 2 (softplus(x) ≤ |x| + log 2) plus the bound
            double u = options.Numeric == NumericMode.F32 ? Math.ScaleB(1.0, -24) : Math.ScaleB(1.0, -53);
            ScoreBound = models.Select((m, k) =>
            {
                double c = Math.Abs(Offsets[k]), f = Magnitude(m.Model) + m.ErrorBound;
                return m.ErrorBound + u * c + u * (f + c * (1 + u));
            }).Max() * (1 + 1e-6);
        }
        Banner = [.. models.SelectMany((m, k) => new[]
        {
            string.Create(inv,
                $"model {k + 1} ({m.Options.Name}): {Naming.CommentText(m.ModelLabel)}, sha256 {m.Model.Sha256}"),
            string.Create(inv, $"    log Z = {LogZ[k]:R}, log prior = {LogPriors[k]:R}"),
        })];
    }

    /// <summary>An upper bound of |F(v)| over all inputs: every parameter's magnitude, plus hidden · log 2.</summary>
    private static double Magnitude(BoltzmannModel m) =>
        m.VisibleBias.Sum(Math.Abs) + m.HiddenBias.Sum(Math.Abs) + m.Weights.Sum(Math.Abs)
        + m.VisibleLinks.Sum(l => Math.Abs(l.W)) + m.HiddenLinks.Sum(l => Math.Abs(l.W)) + m.Hidden * Math.Log(2);

    /// <summary>The classifier's options (its name, mode, targets; <see cref="CompileOptions.Fixed"/> as given).
    /// </summary>
    public CompileOptions Options { get; }

    /// <summary>One scorer plan per model, in the order given.</summary>
    public IReadOnlyList<ScorerPlan> Models { get; }

    /// <summary>Number of models (classes).</summary>
    public int Count => Models.Count;

    /// <summary>log π_k, the priors normalised to sum to 1.</summary>
    public IReadOnlyList<double> LogPriors { get; }

    /// <summary>Each model's stored log Z.</summary>
    public IReadOnlyList<double> LogZ { get; }

    /// <summary>c_k = log π_k − log Z_k (nats): score_k = c_k − F_k.</summary>
    public IReadOnlyList<double> Offsets { get; }

    /// <summary>Fixed mode: c_k in energy units (round to nearest of c_k · 2^E); empty in the float modes.</summary>
    public IReadOnlyList<long> OffsetUnits { get; } = [];

    /// <summary>Fixed mode: E, the fraction bits shared by every model's energy; 0 in the float modes.</summary>
    public int EnergyFractionBits { get; }

    /// <summary>|score_k − exact score_k| ≤ this for every input and every k (nats).</summary>
    public double ScoreBound { get; }

    /// <summary>One line per model for the banners: file, SHA-256, log Z, log prior.</summary>
    public IReadOnlyList<string> Banner { get; }

    /// <summary>The mode as text.</summary>
    public string Mode => Options.Numeric.ToText();

    /// <summary>The visible units (the same in every model).</summary>
    public int Visible => Models[0].Visible;
}
