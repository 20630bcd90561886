using Emit.Model;
using Emit.Reference;

namespace Emit.Analysis;

/// <summary>
/// The result of <see cref="ModelDiff.Compare"/>: ΔF = F_new − F_old over <see cref="Vectors"/> vectors.
/// </summary>
public sealed record ModelDiffReport(
    ModelDiffReport.Side Old,
    ModelDiffReport.Side New,
    IReadOnlyList<ModelDiffReport.Rename> RenamedUnits,
    long Vectors,
    double MeanDelta,
    double RmsDelta,
    double MaxAbsDelta,
    long MaxAbsDeltaIndex,
    double? Correlation,
    double? MeanLogProbabilityDelta,
    ModelDiffReport.DecisionCounts? Decisions)
{
    /// <summary>One model's identity and the numbers that set its decisions.</summary>
    public sealed record Side(string Sha256, ModelKind Kind, int Visible, int Hidden, double? Threshold,
        double? LogPartition);

    /// <summary>
    /// A visible unit whose name differs between the versions (vectors are matched by column, not by name).
    /// </summary>
    public sealed record Rename(int Unit, string OldName, string NewName);

    /// <summary>
    /// Decisions of the two versions (unusual when F &gt; threshold): unchanged either way, newly unusual, no longer
    /// unusual; <see cref="FirstChanged"/> lists the first vector indexes (from 0) whose decision changed.
    /// </summary>
    public sealed record DecisionCounts(long BothUsual, long BothUnusual, long NewlyUnusual, long NoLongerUnusual,
        IReadOnlyList<long> FirstChanged)
    {
        /// <summary>Vectors whose decision changed, either way.</summary>
        public long Changed => NewlyUnusual + NoLongerUnusual;
    }
}
