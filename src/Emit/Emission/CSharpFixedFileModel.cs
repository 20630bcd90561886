namespace Emit.Emission;

/// <summary>What the fixed-point C# template prints: every number, table and comment already formatted. Members keep their C# names in templates.</summary>
public sealed class CSharpFixedFileModel
{
    public required string FileName { get; init; }
    public required string Banner { get; init; }
    public required string Namespace { get; init; }
    public required string ClassName { get; init; }
    public required string Summary { get; init; }
    public required string ModelSha256 { get; init; }

    public required string AccType { get; init; }
    public required string WeightType { get; init; }
    public required string TableEntryType { get; init; }
    public required string EnergyFormat { get; init; }
    public required int EnergyFractionBits { get; init; }
    public required string EnergyScaleLiteral { get; init; }
    public required string EnergyMin { get; init; }
    public required string EnergyMax { get; init; }

    public required int Visible { get; init; }
    public required int Hidden { get; init; }
    public required int PackedBytes { get; init; }
    public required string LastByteMask { get; init; }
    public required bool HasPartialByte { get; init; }
    public required bool HasHidden { get; init; }
    public required bool IsGeneral { get; init; }
    public required bool HasLinks { get; init; }
    public required bool PairRows { get; init; }
    public required bool NeedsToEnergy { get; init; }
    public required bool HasFractionBitsTable { get; init; }

    public required bool HasThreshold { get; init; }
    public required string Threshold { get; init; }
    public required string ThresholdComment { get; init; }
    public required string ErrorBound { get; init; }

    public required int TableSegments { get; init; }
    public required int TableStepBits { get; init; }
    public required string TableStepText { get; init; }
    public required string TableEntryFormat { get; init; }
    public required int LseTableShift { get; init; }
    public required int LateralShift { get; init; }
    public required string LateralFormat { get; init; }
    public required string EnergyOffset { get; init; }
    public required string UnitFractionBitsOfJ { get; init; }
    public required string UnitFractionBitsOfK { get; init; }
    public required string HiddenFormatText { get; init; }
    public required string FractionBitsFormats { get; init; }
    public required string WeightFormatText { get; init; }

    public required string FormatComment { get; init; }
    public required string FreeEnergyComment { get; init; }
    public required string ToEnergyComment { get; init; }
    public required string LookupComment { get; init; }
    public required string SoftplusComment { get; init; }
    public required string Lse2Comment { get; init; }
    public required string LogSumExpComment { get; init; }

    public required string VisibleBiasRows { get; init; }
    public required string HiddenBiasRows { get; init; }
    public required string FractionBitsRows { get; init; }
    public required string WeightRows { get; init; }
    public required string TableRows { get; init; }
    public required string LinkStartRows { get; init; }
    public required string LinkOtherRows { get; init; }
    public required string LinkWeightRows { get; init; }
    public required string HiddenPairRows { get; init; }

    public required int SelfTestCount { get; init; }
    public required string SelfTestVectorRows { get; init; }
    public required string SelfTestExpectedRows { get; init; }

    public required bool HasUnitConstants { get; init; }
    public required string UnitConstants { get; init; }
}
