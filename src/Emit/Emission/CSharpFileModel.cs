namespace Emit.Emission;

/// <summary>What the C# template prints: every number and table already formatted. Members keep their C# names in templates.</summary>
public sealed class CSharpFileModel
{
    public required string FileName { get; init; }
    public required string Banner { get; init; }
    public required string Namespace { get; init; }
    public required string ClassName { get; init; }
    public required string Summary { get; init; }
    public required string ModelSha256 { get; init; }
    public required string Mode { get; init; }

    public required string EnergyType { get; init; }
    public required string Zero { get; init; }
    public required string One { get; init; }
    public required string MathType { get; init; }

    public required int Visible { get; init; }
    public required int Hidden { get; init; }
    public required int PackedBytes { get; init; }
    public required string LastByteMask { get; init; }
    public required bool HasPartialByte { get; init; }
    public required bool HasHidden { get; init; }
    public required bool IsGeneral { get; init; }
    public required bool HasLinks { get; init; }

    public required bool HasThreshold { get; init; }
    public required string Threshold { get; init; }
    public required string ErrorBound { get; init; }

    public required int GrayBlockBits { get; init; }
    public required int GrayBlockSize { get; init; }
    public required int GrayBlocks { get; init; }

    public required string VisibleBiasRows { get; init; }
    public required string HiddenBiasRows { get; init; }
    public required string WeightRows { get; init; }
    public required string LinkStartRows { get; init; }
    public required string LinkOtherRows { get; init; }
    public required string LinkWeightRows { get; init; }
    public required string HiddenPairRows { get; init; }

    public required int SelfTestCount { get; init; }
    public required string SelfTestVectorRows { get; init; }
    public required string SelfTestExpectedRows { get; init; }
    public required string SelfTestToleranceRows { get; init; }

    public required bool HasUnitConstants { get; init; }
    public required string UnitConstants { get; init; }
}
