namespace Emit.Emission;

/// <summary>What the fixed-point C templates print: every number, table and comment already formatted. Members keep their C# names in templates.</summary>
public sealed class CFixedFileModel : CHeaderModel
{
    // header
    public required int EnergyFractionBits { get; init; }
    public required string EnergyFormat { get; init; }
    public required string EnergyScaleLiteral { get; init; }
    public required string ThresholdComment { get; init; }
    public required string FormatComment { get; init; }
    public required string AccType { get; init; }
    public required string UAccType { get; init; }
    public required string WeightType { get; init; }
    public required int AccBits { get; init; }
    public required string AccMin { get; init; }
    public required string AccMax { get; init; }
    public required int WeightBits { get; init; }
    public required string WeightMin { get; init; }
    public required string WeightMax { get; init; }
    public required string EnergyMin { get; init; }
    public required string EnergyMax { get; init; }

    // source: configuration checks
    public required IReadOnlyList<string> TypeChecks { get; init; }

    // source: shapes
    public required string IndexType { get; init; }
    public required string LinkStartType { get; init; }
    public required string LinkOtherType { get; init; }
    public required string LastByteMask { get; init; }
    public required bool HasPartialByte { get; init; }
    public required bool HasHidden { get; init; }
    public required bool IsGeneral { get; init; }
    public required bool HasLinks { get; init; }
    public required int LinkCount { get; init; }
    public required bool GroupRows { get; init; }
    public required bool RowBlocks { get; init; }
    public required bool RowRemainder { get; init; }
    public required bool NeedsToEnergy { get; init; }

    // source: tables
    public required string VisibleBiasRows { get; init; }
    public required string HiddenFormatText { get; init; }
    public required string HiddenBiasRows { get; init; }
    public required bool HasFractionBitsTable { get; init; }
    public required string FractionBitsFormats { get; init; }
    public required string FractionBitsRows { get; init; }
    public required string WeightFormatText { get; init; }
    public required string WeightRows { get; init; }
    public required string LateralFormat { get; init; }
    public required string LinkStartRows { get; init; }
    public required string LinkOtherRows { get; init; }
    public required string LinkWeightRows { get; init; }
    public required string HiddenPairRows { get; init; }
    public required int TableSegments { get; init; }
    public required string TableStepText { get; init; }
    public required string TableRangeText { get; init; }
    public required string TableEntryFormat { get; init; }
    public required string TableEntryType { get; init; }
    public required string TableRows { get; init; }

    // source: scoring constants and comments
    public required int TableStepBits { get; init; }
    public required int LseTableShift { get; init; }
    public required int LateralShift { get; init; }
    public required string EnergyOffset { get; init; }
    public required string UnitFractionBitsOfJ { get; init; }
    public required string UnitFractionBitsOfK { get; init; }
    public required string ToEnergyComment { get; init; }
    public required string LookupComment { get; init; }
    public required string SoftplusComment { get; init; }
    public required string Lse2Comment { get; init; }
    public required string LogSumExpComment { get; init; }
    public required string FreeEnergyComment { get; init; }

    // source: self-test
    public required string SelfTestVectorRows { get; init; }
    public required string SelfTestExpectedRows { get; init; }
}
