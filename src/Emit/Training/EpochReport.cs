namespace Emit.Training;

/// <summary>
/// What one epoch did, for progress displays and the model's metadata.
/// </summary>
/// <param name="Epoch">1-based epoch number.</param>
/// <param name="Epochs">Epochs planned.</param>
/// <param name="LearningRate">Learning rate used in this epoch.</param>
/// <param name="ReconstructionError">Mean squared difference between training rows and their mean-field reconstructions
/// p(v | E[h | v]), over the first 256 training rows.</param>
/// <param name="FreeEnergyGap">Mean free energy of the validation rows minus that of as many training rows (Hinton's
/// practical guide, section 6: a growing gap means overfitting), or null without validation rows.</param>
/// <param name="ValidationLogLikelihood">Exact mean log p(v) of the validation rows (log Z by enumeration), or null
/// when there are no validation rows or the model is too large for exact log Z.</param>
/// <param name="ValidationPseudoLogLikelihood">Mean pseudo-log-likelihood of the validation rows (one unit per row,
/// chosen once), or null; used for early stopping when the exact figure is not available.</param>
/// <param name="Best">True when this epoch has the best validation score so far (the one kept).</param>
public sealed record EpochReport(
    int Epoch,
    int Epochs,
    double LearningRate,
    double ReconstructionError,
    double? FreeEnergyGap,
    double? ValidationLogLikelihood,
    double? ValidationPseudoLogLikelihood,
    bool Best)
{
    /// <summary>The figure early stopping compares (higher is better), or null without validation rows.</summary>
    public double? Score => ValidationLogLikelihood ?? ValidationPseudoLogLikelihood;
}
