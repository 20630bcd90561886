using System.Collections.Immutable;
using System.Globalization;
using Emit.Model;

namespace Emit.Quantize;

/// <summary>
/// Everything the fixed-point scorer is made of: formats, quantized tables, per-unit constants, the range
/// analysis that proves no intermediate overflows, and the worst-case error bound. Built by
/// <see cref="FixedPointPlanner"/>; executed bit-exactly by <see cref="FixedPointSimulator"/>; rendered into C and
/// C# by the emitters. The arithmetic is specified in docs/fixed-point.md and on <see cref="FixedPointSimulator"/>.
/// </summary>
public sealed record FixedPointPlan
{
    /// <summary>The quantized model.</summary>
    public required BoltzmannModel Model { get; init; }

    /// <summary>Options as given (accumulator null = auto).</summary>
    public required FixedPointOptions Options { get; init; }

    /// <summary>Weight storage type.</summary>
    public WeightType WeightType => Options.Weights;

    /// <summary>Accumulator type actually used (auto resolved).</summary>
    public required AccumulatorType Accumulator { get; init; }

    /// <summary>Why this accumulator was chosen (one sentence, for inspect).</summary>
    public required string AccumulatorReason { get; init; }

    /// <summary>
    /// E: fraction bits of the energy, the visible biases, the table entries and (general) the scores.
    /// </summary>
    public required int EnergyFractionBits { get; init; }

    /// <summary>Format of the energy result and of the energy accumulator.</summary>
    public QFormat EnergyFormat => new(Accumulator.Bits(), EnergyFractionBits);

    /// <summary>2^E: real free energy = integer result / EnergyScale.</summary>
    public double EnergyScale => Math.ScaleB(1.0, EnergyFractionBits);

    /// <summary>
    /// K: the energy accumulator's initial value (format E), a centring constant, see <see cref="ErrorBudget.Offset"/>.
    /// </summary>
    public required long EnergyOffset { get; init; }

    /// <summary>
    /// Quantized W, row-major [i * Hidden + j]; column j in format <see cref="HiddenUnitPlan.WeightFormat"/>.
    /// </summary>
    public required ImmutableArray<long> Weights { get; init; }

    /// <summary>Per hidden unit constants.</summary>
    public required ImmutableArray<HiddenUnitPlan> Units { get; init; }

    /// <summary>round(b_i · 2^E), accumulator type.</summary>
    public required ImmutableArray<long> VisibleBias { get; init; }

    /// <summary>f_L: fraction bits of the lateral weights and the lateral accumulator.</summary>
    public required int LateralFractionBits { get; init; }

    /// <summary>Format of a stored lateral weight (weight type).</summary>
    public QFormat LateralFormat => new(WeightType.Bits(), LateralFractionBits);

    /// <summary>s_L = f_L − E: the lateral sum enters the energy as to_energy(lateral, s_L).</summary>
    public int LateralShift => LateralFractionBits - EnergyFractionBits;

    /// <summary>Quantized lateral links round(L_ij · 2^f_L), weight type, same order as the model's.</summary>
    public required ImmutableArray<QLink> Lateral { get; init; }

    /// <summary>general: quantized hidden links round(M_kl · 2^E), accumulator type; empty otherwise.</summary>
    public required ImmutableArray<QLink> HiddenLinks { get; init; }

    /// <summary>The softplus (and log1p(exp(−d))) table.</summary>
    public required SoftplusTable Table { get; init; }

    /// <summary>general: d_E = E − e, the table index shift for log-sum-exp differences (format E).</summary>
    public int LseTableShift => EnergyFractionBits - Table.StepFractionBits;

    /// <summary>general: P_E = R · 2^E: differences ≥ P_E give G = 0.</summary>
    public long LseTableLimit => (long)Table.Limit(EnergyFractionBits);

    /// <summary>Ranges of the model in real arithmetic.</summary>
    public required RangeAnalysis Ranges { get; init; }

    /// <summary>Every intermediate's integer range and the limit it was checked against (all hold).</summary>
    public required ImmutableArray<RangeCheck> Checks { get; init; }

    /// <summary>The error analysis.</summary>
    public required ErrorBudget Error { get; init; }

    /// <summary>Worst-case |F_fixed(v) − F_exact(v)| over all binary v, in nats.</summary>
    public double ErrorBound => Error.Bound;

    /// <summary>Bytes of the weight table W.</summary>
    public long WeightBytes => (long)Model.Visible * Model.Hidden * WeightType.Bits() / 8;

    /// <summary>Bytes of the softplus table.</summary>
    public int TableBytes => Table.Bytes;

    /// <summary>The distinct weight formats with their unit counts, e.g. "Q1.14 (12 units), Q2.13 (8 units)".</summary>
    public string WeightFormatSummary => Summary(Units.Select(u => u.WeightFormat));

    /// <summary>The distinct hidden accumulator formats with their unit counts.</summary>
    public string AccumulatorFormatSummary => Summary(Units.Select(u => u.AccumulatorFormat));

    private static string Summary(IEnumerable<QFormat> formats)
    {
        var groups = formats.GroupBy(f => f).OrderByDescending(g => g.Count()).ThenBy(g => g.Key.FractionBits).ToList();
        if (groups.Count == 0) return "none";
        return string.Join(", ", groups.Select(g =>
            g.Key + " (" + g.Count().ToString(CultureInfo.InvariantCulture) + (g.Count() == 1 ? " unit)" : " units)")));
    }
}
