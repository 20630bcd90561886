namespace Emit.Training;

/// <summary>
/// Trains a Boltzmann machine on binary rows by stochastic gradient ascent on the log-likelihood, the gradient being
/// the difference between statistics under the data (positive phase) and under the model (negative phase):
/// <list type="bullet">
/// <item>kind rbm: contrastive divergence CD-k (Hinton, "Training products of experts by minimizing contrastive
/// divergence", Neural Computation 14(8), 2002) or persistent CD (Tieleman, "Training restricted Boltzmann machines
/// using approximations to the likelihood gradient", ICML 2008), with mini-batches, momentum, L2 weight decay, visible
/// biases started at the log-odds of the data marginals and a decaying learning rate (Hinton, "A practical guide to
/// training restricted Boltzmann machines", UTML TR 2010-003).</item>
/// <item>kind lateral: the same positive phase (hidden units are independent given the visible ones) plus v_i v_j
/// statistics; the negative chains update each visible unit in turn from its energy gap given all other units
/// (the sequential stochastic update of Ackley, Hinton and Sejnowski, "A learning algorithm for Boltzmann machines",
/// Cognitive Science 9, 1985), then the hidden layer in one block.</item>
/// <item>kind general: the positive phase is the exact posterior over hidden states given each row, by enumerating
/// the 2^hidden states in Gray-code order; the negative chains update visible and then hidden units in turn.</item>
/// </list>
/// Deterministic: SplitMix64 streams (one per batch slot), <see cref="TrainingMath"/> instead of the platform's exp,
/// and every sum in a fixed order. Work is split over threads by batch slot and by visible unit, never inside a sum,
/// so the model has the same bits for any thread count.
/// </summary>
public static class Trainer
{
    /// <summary>
    /// Trains a model on <paramref name="data"/>. With <paramref name="validation"/> rows, each epoch is scored on them
    /// and the best epoch's parameters are returned (early stopping after <see cref="TrainerSettings.Patience"/> epochs
    /// without improvement). Checks <paramref name="cancel"/> before every batch and throws
    /// <see cref="OperationCanceledException"/> when it is set.
    /// </summary>
    public static TrainingResult Train(TrainingData data, TrainerSettings settings, TrainingData? validation = null,
        Action<EpochReport>? progress = null, CancellationToken cancel = default)
    {
        ArgumentNullException.ThrowIfNull(data);
        ArgumentNullException.ThrowIfNull(settings);
        settings.Validate();
        if (data.Rows < settings.BatchSize)
            throw new EmitException($"{data.Rows} rows, fewer than the batch size {settings.BatchSize}",
                "give more rows or a smaller batch", data.Source);
        if (validation is not null && validation.Width != data.Width)
            throw new EmitException($"validation rows have {validation.Width} values, the training rows {data.Width}",
                null, validation.Source);
        using var run = new TrainingRun(data, validation, settings);
        return run.Execute(progress, cancel);
    }
}
