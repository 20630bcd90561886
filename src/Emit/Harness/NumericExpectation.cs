using System.Globalization;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Harness;

/// <summary>
/// What a generated scorer in one numeric mode must deliver, and how to read its results: the width and scale of its
/// result, the error bound it is held to (and how that bound is derived), the bit-exact integer simulator in fixed
/// mode, and the allowance for the threshold's own rounding.
/// </summary>
public sealed class NumericExpectation
{
    private NumericExpectation(NumericMode mode, string weights, int energyBytes, double scale, double errorBound,
        string basis, FixedPointSimulator? simulator, double? threshold, double thresholdAllowance)
    {
        Mode = mode;
        Weights = weights;
        EnergyBytes = energyBytes;
        Scale = scale;
        ErrorBound = errorBound;
        BoundBasis = basis;
        Simulator = simulator;
        Threshold = threshold;
        ThresholdAllowance = thresholdAllowance;
    }

    /// <summary>The numeric mode of the generated code.</summary>
    public NumericMode Mode { get; }

    /// <summary>How coefficients are stored: f32 or f64 in the float modes, int8/int16/int32 in fixed mode.</summary>
    public string Weights { get; }

    /// <summary>Bytes of the generated scorer's result type.</summary>
    public int EnergyBytes { get; }

    /// <summary>Real free energy = result / Scale (1 in the float modes, 2^E in fixed mode).</summary>
    public double Scale { get; }

    /// <summary>
    /// |F_generated − F_reference| must not exceed this for any input (nats): the bound stated for the generated code
    /// plus the reference scorer's own bound.
    /// </summary>
    public double ErrorBound { get; }

    /// <summary>One sentence saying how <see cref="ErrorBound"/> is derived.</summary>
    public string BoundBasis { get; }

    /// <summary>
    /// Fixed mode: the bit-exact simulation of the generated integer arithmetic; null in the float modes.
    /// </summary>
    public FixedPointSimulator? Simulator { get; }

    /// <summary>The model's threshold (nats), or null.</summary>
    public double? Threshold { get; }

    /// <summary>How far the threshold in generated code may lie from the model's (its rounding to the mode).</summary>
    public double ThresholdAllowance { get; }

    /// <summary>True in fixed mode, where results must also match the bit-exact simulator.</summary>
    public bool IsFixed => Simulator is not null;

    /// <summary>
    /// Plans the expectation; throws <see cref="EmitException"/> when the model cannot be compiled in this mode.
    /// </summary>
    public static NumericExpectation For(BoltzmannModel model, NumericMode mode, FixedPointOptions? fixedOptions)
    {
        var inv = CultureInfo.InvariantCulture;
        double reference = FloatErrorBound.ReferenceWorst(model);
        if (mode.IsFloat())
        {
            double generated = FloatErrorBound.Worst(model, mode);
            double allowance = model.Threshold is { } t ? Math.Abs(Literals.Round(t, mode, "threshold") - t) : 0;
            var basis = $"{mode.ToText()} forward error analysis of the generated code " +
                $"({generated.ToString("G3", inv).ToLowerInvariant()} nats: " +
                        $"unit roundoff {FloatErrorBound.UnitRoundoff(mode).ToString("G3", inv).ToLowerInvariant()}, " +
                        $"exp/log within {FloatErrorBound.LibmUlps.ToString(inv)} ulps, " +
                        "all units on) plus the reference scorer's own bound " +
                        $"({reference.ToString("G3", inv).ToLowerInvariant()} nats)";
            return new NumericExpectation(mode, mode.ToText(), mode == NumericMode.F32 ? 4 : 8, 1.0,
                generated + reference, basis, null, model.Threshold, allowance);
        }
        var options = fixedOptions ?? new FixedPointOptions();
        options.Validate();
        var plan = FixedPointPlanner.Build(model, options);
        var fixedBasis = "proved worst-case bound of the integer plan " +
            $"({plan.ErrorBound.ToString("G3", inv).ToLowerInvariant()} nats: {options.Weights.ToText()} weights, " +
                         $"{plan.Accumulator.ToText()} accumulator, " +
                         $"{options.SoftplusTableSize.ToString(inv)}-segment softplus table) " +
                         $"plus the reference scorer's own bound ({reference.ToString("G3", inv).ToLowerInvariant()} " +
                         "nats)";
        // The generated threshold is floor(t·2^E) (FixedScorerPlan.ThresholdUnits), so an integer result f is above it
        // exactly when f / 2^E > t: the threshold adds nothing to the bound.
        return new NumericExpectation(mode, options.Weights.ToText(), plan.Accumulator.Bits() / 8, plan.EnergyScale,
            plan.ErrorBound + reference,
            fixedBasis, new FixedPointSimulator(plan), model.Threshold, 0);
    }

    /// <summary>The harness layout for this mode and model.</summary>
    public HarnessLayout Layout(BoltzmannModel model) => new(model.Visible, EnergyBytes);

    /// <summary>The integer a fixed-point result's bits hold (sign-extended from <see cref="EnergyBytes"/>).</summary>
    public long RawInteger(ulong bits) => EnergyBytes == 4 ? unchecked((int)(uint)bits) : unchecked((long)bits);

    /// <summary>The real free energy (nats) a result's bits stand for.</summary>
    public double Decode(ulong bits)
    {
        if (IsFixed) return RawInteger(bits) / Scale;
        return EnergyBytes == 4 ? BitConverter.UInt32BitsToSingle((uint)bits) : BitConverter.UInt64BitsToDouble(bits);
    }
}
