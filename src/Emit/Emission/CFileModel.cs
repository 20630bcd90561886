namespace Emit.Emission;

/// <summary>What the float-mode C templates print: every number and table already formatted. Members keep their C# names in templates.</summary>
public sealed class CFileModel : CHeaderModel
{
    public required bool IsF32 { get; init; }

    public required string Zero { get; init; }
    public required string One { get; init; }
    public required string Exp { get; init; }
    public required string Log { get; init; }
    public required string Fabs { get; init; }
    public required string IndexType { get; init; }
    public required string LinkStartType { get; init; }
    public required string LinkOtherType { get; init; }

    public required string LastByteMask { get; init; }
    public required bool HasPartialByte { get; init; }
    public required bool HasHidden { get; init; }
    public required bool IsGeneral { get; init; }
    public required bool HasLinks { get; init; }
    public required int LinkCount { get; init; }

    public required int GrayBlockBits { get; init; }
    public required string GrayBlockSize { get; init; }
    public required int GrayBlockStates { get; init; }
    public required string GrayBlocks { get; init; }

    public required string VisibleBiasRows { get; init; }
    public required string HiddenBiasRows { get; init; }
    public required string WeightRows { get; init; }
    public required string LinkStartRows { get; init; }
    public required string LinkOtherRows { get; init; }
    public required string LinkWeightRows { get; init; }
    public required string HiddenPairRows { get; init; }

    public required string SelfTestVectorRows { get; init; }
    public required string SelfTestExpectedRows { get; init; }
    public required string SelfTestToleranceRows { get; init; }
}
