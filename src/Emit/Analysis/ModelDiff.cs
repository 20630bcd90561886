using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Analysis;

/// <summary>
/// How two versions of a model differ in behaviour on the same vectors, by the double-precision reference scorer:
/// the change of free energy ΔF = F_new − F_old, how closely the two rank the vectors (Pearson correlation of F),
/// and, when both have a threshold, which decisions change. Streams the vectors in batches (constant memory).
/// </summary>
public static class ModelDiff
{
    /// <summary>Vectors scored per parallel batch.</summary>
    public const int BatchRows = 4096;

    /// <summary>How many indexes of changed decisions (and unit-name changes) a report lists.</summary>
    public const int Listed = 20;

    /// <summary>
    /// Compares <paramref name="oldModel"/> and <paramref name="newModel"/> on every vector of
    /// <paramref name="reader"/>.
    /// </summary>
    public static ModelDiffReport Compare(BoltzmannModel oldModel, BoltzmannModel newModel, VectorReader reader)
    {
        if (oldModel.Visible != newModel.Visible)
            throw new EmitException($"the models have {oldModel.Visible} and {newModel.Visible} visible units",
                "models can only be compared on the same status flags");
        var renamed = new List<ModelDiffReport.Rename>();
        if (!oldModel.Names.IsEmpty && !newModel.Names.IsEmpty)
            for (int i = 0; i < oldModel.Visible && renamed.Count < Listed; i++)
                if (oldModel.Names[i] != newModel.Names[i]) renamed.Add(new(i, oldModel.Names[i], newModel.Names[i]));

        var oldScorer = new ReferenceScorer(oldModel);
        var newScorer = new ReferenceScorer(newModel);
        double? tOld = oldModel.Threshold, tNew = newModel.Threshold;
        bool decisions = tOld is not null && tNew is not null;
        bool logP = oldModel.LogPartition is not null && newModel.LogPartition is not null;

        int v = oldModel.Visible;
        int batch = VectorBatch.Rows(v, BatchRows);
        var units = new byte[batch * v];
        var fOld = new double[batch];
        var fNew = new double[batch];
        long n = 0, bothUsual = 0, bothUnusual = 0, newlyUnusual = 0, noLonger = 0, maxIndex = -1;
        double maxAbs = 0, sumDelta = 0, sumSq = 0;
        // Welford's running moments for the correlation of F_old and F_new.
        double meanOld = 0, meanNew = 0, m2Old = 0, m2New = 0, coMoment = 0;
        var changed = new List<long>();
        int rows;
        while ((rows = reader.ReadBatch(units, batch)) > 0)
        {
            oldScorer.FreeEnergies(units, rows, fOld);
            newScorer.FreeEnergies(units, rows, fNew);
            for (int r = 0; r < rows; r++, n++)
            {
                double a = fOld[r], b = fNew[r], d = b - a;
                sumDelta += d;
                sumSq += d * d;
                if (Math.Abs(d) > maxAbs || maxIndex < 0) { maxAbs = Math.Abs(d); maxIndex = n; }
                double k = n + 1, dOld = a - meanOld, dNew = b - meanNew;
                meanOld += dOld / k;
                meanNew += dNew / k;
                m2Old += dOld * (a - meanOld);
                m2New += dNew * (b - meanNew);
                coMoment += dOld * (b - meanNew);
                if (!decisions) continue;
                bool uOld = a > tOld!.Value, uNew = b > tNew!.Value;
                if (uOld == uNew) { if (uOld) bothUnusual++; else bothUsual++; continue; }
                if (uNew) newlyUnusual++; else noLonger++;
                if (changed.Count < Listed) changed.Add(n);
            }
        }
        if (n == 0)
            throw new EmitException("the vector file holds no vectors", "give at least one vector", reader.Source);
        double? correlation = m2Old > 0 && m2New > 0 ? coMoment / Math.Sqrt(m2Old * m2New) : null;
        double? logZDelta = logP ? newModel.LogPartition!.Value - oldModel.LogPartition!.Value : null;
        return new ModelDiffReport(
            new ModelDiffReport.Side(oldModel.Sha256, oldModel.Kind, oldModel.Visible, oldModel.Hidden, tOld,
                oldModel.LogPartition?.Value),
            new ModelDiffReport.Side(newModel.Sha256, newModel.Kind, newModel.Visible, newModel.Hidden, tNew,
                newModel.LogPartition?.Value),
            renamed, n, sumDelta / n, Math.Sqrt(sumSq / n), maxAbs, maxIndex, correlation,
            // log p = −F − log Z, so Δlog p = −ΔF − Δlog Z and its mean follows from the mean of ΔF.
            logZDelta is { } dz ? -(sumDelta / n) - dz : null,
            decisions ? new ModelDiffReport.DecisionCounts(bothUsual, bothUnusual, newlyUnusual, noLonger, changed)
            : null);
    }
}
