using Emit.Model;
using Emit.Reference;

namespace Emit.Analysis;

/// <summary>
/// Bayes' rule across several models of the same status flags (one per operating mode or fault class, each trained on
/// its own data): P(k | v) = π_k p_k(v) / Σ_m π_m p_m(v), with log p_k(v) = −F_k(v) − log Z_k. Every model needs its
/// log partition function (<c>emit logz MODEL --store</c>); the sum is taken in log space, so no term underflows.
/// </summary>
public sealed class BayesClassifier
{
    private readonly ReferenceScorer[] _scorers;
    private readonly double[] _offset; // log π_k − log Z_k

    /// <param name="models">The models, at least two, all with the same number of visible units and a stored log
    /// Z.</param>
    /// <param name="labels">A name per model, for messages.</param>
    /// <param name="priors">Prior weights (positive; normalised here), or null for equal priors.</param>
    public BayesClassifier(IReadOnlyList<BoltzmannModel> models, IReadOnlyList<string> labels,
        IReadOnlyList<double>? priors = null)
    {
        if (models.Count < 2)
            throw new EmitException("Bayes' rule needs at least two models", "give one model per class");
        if (labels.Count != models.Count) throw new ArgumentException("one label per model", nameof(labels));
        CheckModels(models, labels, priors);
        var logPriors = LogPriors(models.Count, priors);
        _scorers = models.Select(m => new ReferenceScorer(m)).ToArray();
        _offset = models.Select((m, k) => logPriors[k] - m.LogPartition!.Value).ToArray();
        Visible = models[0].Visible;
    }

    /// <summary>
    /// Refuses models Bayes' rule cannot combine (shared by <c>emit classify</c> and the generated classifier): other
    /// visible counts, a missing stored log Z, priors that are not one positive finite weight per model.
    /// </summary>
    public static void CheckModels(IReadOnlyList<BoltzmannModel> models, IReadOnlyList<string> labels,
        IReadOnlyList<double>? priors)
    {
        for (int k = 1; k < models.Count; k++)
            if (models[k].Visible != models[0].Visible)
                throw new EmitException(
                    $"{labels[k]} has {models[k].Visible} visible units and {labels[0]} has {models[0].Visible}",
                    "every model must describe the same status flags", labels[k]);
        for (int k = 0; k < models.Count; k++)
            if (models[k].LogPartition is null)
                throw new EmitException("the model has no log_partition, so p(v) is unknown",
                    "run emit logz MODEL --store first", labels[k]);
        if (priors is null) return;
        if (priors.Count != models.Count)
            throw new EmitException($"{priors.Count} priors for {models.Count} models",
                "give one prior per model, in the same order");
        if (priors.Any(p => !(p > 0) || !double.IsFinite(p)))
            throw new EmitException("every prior must be a positive finite number",
                "priors are relative weights, e.g. 0.9,0.1");
    }

    /// <summary>
    /// log π_k = log w_k − log Σ_m w_m (equal weights when <paramref name="priors"/> is null), the sum taken in log
    /// space: w = 1e308, 1e308 would overflow a plain Σ.
    /// </summary>
    public static double[] LogPriors(int count, IReadOnlyList<double>? priors)
    {
        var logW = Enumerable.Range(0, count).Select(k => Math.Log(priors?[k] ?? 1.0)).ToArray();
        double logMax = logW.Max(), scaled = 0;
        foreach (double lw in logW) scaled += Math.Exp(lw - logMax);
        double logTotal = logMax + Math.Log(scaled);
        return logW.Select(w => w - logTotal).ToArray();
    }

    /// <summary>Number of classes (models).</summary>
    public int Classes => _scorers.Length;

    /// <summary>Visible units of every model.</summary>
    public int Visible { get; }

    /// <summary>
    /// Posteriors of <paramref name="rows"/> vectors laid end to end in <paramref name="units"/>: row r's P(k | v) at
    /// <c>posterior[r * Classes + k]</c>.
    /// </summary>
    /// <param name="units">Rows of <see cref="Visible"/> bytes, 0 or 1, laid end to end.</param>
    /// <param name="rows">Number of rows.</param>
    /// <param name="posterior">Receives rows × <see cref="Classes"/> probabilities.</param>
    /// <param name="firstIndex">Index of the first row among all vectors read, for error messages.</param>
    public void Posteriors(byte[] units, int rows, double[] posterior, long firstIndex = 0)
    {
        if (posterior.Length < (long)rows * Classes) throw new ArgumentException("buffer too small", nameof(posterior));
        var f = new double[rows];
        for (int k = 0; k < Classes; k++)
        {
            _scorers[k].FreeEnergies(units, rows, f);
            for (int r = 0; r < rows; r++) posterior[r * Classes + k] = _offset[k] - f[r]; // log π_k + log p_k(v)
        }
        for (int r = 0; r < rows; r++)
        {
            var row = posterior.AsSpan(r * Classes, Classes);
            double max = double.NegativeInfinity;
            foreach (var x in row) max = Math.Max(max, x);
            double sum = 0;
            foreach (var x in row) sum += Math.Exp(x - max);
            double logNorm = max + Math.Log(sum);
            // An infinite free energy (parameters near DBL_MAX) would make every posterior NaN: refuse it instead.
            if (!double.IsFinite(logNorm))
                throw new EmitException(
                    $"vector {firstIndex + r} (index column) has a free energy that is not a finite number under at " +
                    "least one model, so its posteriors are undefined",
                    "the models' parameters are too large for double precision; check them with emit inspect");
            for (int k = 0; k < Classes; k++) row[k] = Math.Exp(row[k] - logNorm);
        }
    }
}
