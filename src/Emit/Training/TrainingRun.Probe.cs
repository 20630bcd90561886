using Emit.Model;

namespace Emit.Training;

/// <summary>
/// Access to single phases for the gradient-check tests (tests/Emit.Tests/Training/GradientCheckTests.cs).
/// </summary>
internal sealed partial class TrainingRun
{
    /// <summary>
    /// A run whose parameters are those of <paramref name="model"/> (settings' kind and hidden count must match it).
    /// </summary>
    internal static TrainingRun ForModel(BoltzmannModel model, TrainingData data, TrainerSettings settings)
    {
        var run = new TrainingRun(data, null, settings with { Kind = model.Kind, Hidden = model.Hidden });
        Parameters.From(model).CopyTo(run._p);
        return run;
    }

    /// <summary>
    /// The positive statistics for one row: E[h_j | v] into <paramref name="ph"/>, E[h_k h_l | v] (hidden × hidden;
    /// kind general only) into <paramref name="hh"/>.
    /// </summary>
    internal void PositiveStatistics(ReadOnlySpan<byte> v, Span<double> ph, Span<double> hh)
    {
        var slot = _slot[0];
        HiddenInput(v, slot.A);
        if (_kind == ModelKind.General) Posterior(slot, hh, ph);
        else for (int j = 0; j < _nh; j++) ph[j] = TrainingMath.Sigmoid(slot.A[j]);
    }

    /// <summary>
    /// One Gibbs step of persistent chain <paramref name="k"/> as the negative phase runs it; returns the chain's
    /// visible state and writes the hidden statistic the gradient uses (p(h | v) for rbm and lateral, the sample for
    /// general).
    /// </summary>
    internal ReadOnlySpan<byte> ChainStep(int k, Span<double> hidden)
    {
        VisibleSweep(_slot[k]);
        HiddenSweep(_slot[k], hidden, last: true);
        return _slot[k].V;
    }

    /// <summary>The chain's hidden sample.</summary>
    internal ReadOnlySpan<byte> ChainHidden(int k) => _slot[k].H;
}
