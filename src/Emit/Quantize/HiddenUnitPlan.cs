namespace Emit.Quantize;

/// <summary>
/// Fixed-point constants and analysis results of one hidden unit j. Its accumulator a_j holds
/// x_j · 2^f_j (format <see cref="AccumulatorFormat"/>); its weight column uses the same fraction bits.
/// </summary>
public sealed record HiddenUnitPlan
{
    /// <summary>f_j: fraction bits of the unit's weights, bias and accumulator.</summary>
    public required int FractionBits { get; init; }

    /// <summary>Format of the unit's weight column, e.g. Q1.14 for int16.</summary>
    public required QFormat WeightFormat { get; init; }

    /// <summary>Format of the unit's accumulator, e.g. Q16.15 for int32.</summary>
    public required QFormat AccumulatorFormat { get; init; }

    /// <summary>C_j = round(c_j · 2^f_j): the accumulator's initial value.</summary>
    public required long Bias { get; init; }

    /// <summary>
    /// d_j = f_j − e: for the magnitude m = |a_j| the table index is m &gt;&gt; d_j, the fraction m &amp; (2^d_j − 1).
    /// </summary>
    public required int TableShift { get; init; }

    /// <summary>P_j = R · 2^f_j = N · 2^d_j: magnitudes m ≥ P_j give G = 0.</summary>
    public required long TableLimit { get; init; }

    /// <summary>2^d_j − 1.</summary>
    public long TableMask => (1L << TableShift) - 1;

    /// <summary>
    /// s_j = f_j − E, the argument of to_energy for this unit (upper tail; general: the unit's score term).
    /// </summary>
    public required int EnergyShift { get; init; }

    /// <summary>Exact range of the accumulator over all binary inputs (rounded integer weights).</summary>
    public required IntRange Accumulator { get; init; }

    /// <summary>Exact range of the real pre-activation.</summary>
    public required RealRange Input { get; init; }

    /// <summary>Range of δ_j = a_j·2^−f_j − x_j over all inputs (weight and bias rounding), in nats.</summary>
    public required ErrorInterval InputError { get; init; }

    /// <summary>
    /// rbm/lateral: range of y_j·2^−E − softplus(x_j), the unit's whole contribution to the error of the positive
    /// sum. general: range of the unit's score term error (δ_j plus the to_energy rounding).
    /// </summary>
    public required ErrorInterval Error { get; init; }
}
