using System.Numerics;

namespace Emit.Quantize;

/// <summary>
/// What the user chose for <c>--numeric fixed</c>: weight storage type, accumulator width (null = auto) and
/// the number of softplus table segments (a power of two).
/// </summary>
public sealed record FixedPointOptions(
    WeightType Weights = WeightType.Int16,
    AccumulatorType? Accumulator = null,
    int SoftplusTableSize = FixedPointOptions.DefaultTableSize)
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
        if (!Enum.IsDefined(Weights))
            throw new EmitException($"weight type {Weights} is unknown", "use int8, int16 or int32");
    }
}
