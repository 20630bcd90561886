using System.Numerics;

namespace Emit.Quantize;

/// <summary>
/// What the user chose for <c>--numeric fixed</c>: weight storage type, accumulator width (null = auto) and
/// the number of softplus table segments (a power of two). <see cref="EnergyFractionBitsLimit"/>, when set, caps the
/// energy's fraction bits E (a classifier gives all its models one energy format, docs/fixed-point.md).
/// </summary>
public sealed record FixedPointOptions(
    WeightType Weights = WeightType.Int16,
    AccumulatorType? Accumulator = null,
    int SoftplusTableSize = FixedPointOptions.DefaultTableSize,
    int? EnergyFractionBitsLimit = null)
{
    /// <summary>Default number of softplus table segments (257 entries).</summary>
    public const int DefaultTableSize = 256;

    /// <summary>Fewest table segments allowed.</summary>
    public const int MinTableSize = 8;

    /// <summary>Most table segments allowed.</summary>
    public const int MaxTableSize = 65536;

    /// <summary>Throws <see cref="EmitException"/> unless the options are usable.</summary>
    public void Validate()
    {
        if (SoftplusTableSize < MinTableSize || SoftplusTableSize > MaxTableSize
            || !BitOperations.IsPow2(SoftplusTableSize))
            throw new EmitException($"{Setting.SoftplusTable.Ref()} {SoftplusTableSize} is not allowed",
                $"use a power of two from {MinTableSize} to {MaxTableSize}");
        if (EnergyFractionBitsLimit is < 0 or > FixedPointPlanner.MaxEnergyFractionBits)
            throw new EmitException($"energy fraction bits limit {EnergyFractionBitsLimit} is not allowed",
                $"use 0 to {FixedPointPlanner.MaxEnergyFractionBits}");
        if (!Enum.IsDefined(Weights))
            throw new EmitException($"weight type {Weights} is unknown", "use int8, int16 or int32");
    }
}
