using System.Collections.Immutable;
using System.Globalization;
using Emit.Model;
using Emit.Reference;

namespace Emit.Quantize;

/// <summary>
/// Chooses the fixed-point formats for a model and proves them safe. For every candidate table range R = 2^ρ and
/// energy precision E it gives each hidden unit the most fraction bits f_j its weight column allows in the weight
/// type, lowers f_j (and the lateral f_L) until every intermediate provably fits the accumulator, and computes the
/// worst-case error bound; the candidate with the smallest bound wins (ties: smaller ρ, then larger E).
/// Accumulator auto: int32 when an int32 plan exists that stores the same weights as the best int64 plan (only
/// the energy precision E may be lower) or whose bound is at most 5 % above the int64 plan's; otherwise int64.
/// </summary>
public static class FixedPointPlanner
{
    /// <summary>Most fraction bits given to a weight column or the lateral weights.</summary>
    public const int MaxFractionBits = 30;

    /// <summary>Most fraction bits E of the energy (2^−24 nats is far below any other error term).</summary>
    public const int MaxEnergyFractionBits = 24;

    /// <summary>Smallest and largest ρ tried for the table range R = 2^ρ.</summary>
    public const int MinRangeLog2 = 0, MaxRangeLog2 = 24;

    /// <summary>Most hidden units of a general model (the scorer enumerates 2^hidden states).</summary>
    public const int MaxGeneralHidden = 16;

    /// <summary>Relative bound increase accepted for int32 accumulators under auto.</summary>
    public const double AutoTolerance = 0.05;

    /// <summary>Plans a model; throws <see cref="EmitException"/> when no safe plan exists.</summary>
    public static FixedPointPlan Build(BoltzmannModel model, FixedPointOptions? options = null)
    {
        options ??= new FixedPointOptions();
        options.Validate();
        if (model.Kind == ModelKind.General && model.Hidden > MaxGeneralHidden)
            throw new EmitException(
                $"a general model's fixed-point scorer enumerates all 2^{model.Hidden} hidden states",
                $"kind general is compiled for hidden <= {MaxGeneralHidden}");
        var search = new PlanSearch(model, options);
        if (options.Accumulator is { } forced)
        {
            var only = search.Best(forced) is { } found ? search.Refine(found) : throw new EmitException(
                $"no fixed-point format keeps every intermediate of this model within {forced.ToText()}",
                forced == AccumulatorType.Int32 ? $"use {Setting.Accumulator.Ref()} int64 or auto"
                : "the model's weights are too large for fixed point");
            return search.Materialize(only, $"{forced.ToText()} as requested");
        }
        var p32 = search.Best(AccumulatorType.Int32) is { } c32 ? search.Refine(c32) : null;
        var p64 = (search.Best(AccumulatorType.Int64) is { } c64 ? search.Refine(c64) : null) ?? p32
            ?? throw new EmitException(
            "no fixed-point format keeps every intermediate of this model within int64",
            "the model's weights are too large for fixed point");
        if (p32 is not null && p32.F.AsSpan().SequenceEqual(p64.F)
            && (p32.LateralF == p64.LateralF || model.VisibleLinks.IsEmpty))
            return search.Materialize(p32,
                "auto: int32 provably cannot overflow and keeps every weight at full precision");
        if (p32 is not null && p32.Budget.Bound <= p64.Budget.Bound * (1 + AutoTolerance))
            return search.Materialize(p32,
                "auto: int32 provably cannot overflow and its bound is within 5 % of int64's");
        if (p32 is null) return search.Materialize(p64, "auto: no int32 plan keeps every intermediate in range");
        var inv = CultureInfo.InvariantCulture;
        return search.Materialize(p64,
            $"auto: the best int32 plan's bound {p32.Budget.Bound.ToString("G3", inv)} is more than 5 % above " +
            $"int64's {p64.Budget.Bound.ToString("G3", inv)}");
    }
}
