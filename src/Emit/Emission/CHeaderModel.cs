namespace Emit.Emission;

/// <summary>
/// What the shared C header template (<c>scorer.h.sbn</c>) prints in every numeric mode; <see cref="CFileModel"/>
/// (float) and <see cref="CFixedFileModel"/> (fixed point) add what their source templates need.
/// </summary>
public abstract class CHeaderModel
{
    public required string Name { get; init; }
    public required string UName { get; init; }
    public string HeaderFile => Name + ".h";
    public string Guard => "EMIT_GENERATED_" + UName + "_H";
    public required string HeaderBanner { get; init; }
    public required string SourceBanner { get; init; }
    public required string ModelId { get; init; }

    /// <summary>The model identity the header and source compare at compile time: the SHA-256's first 32 bits as a C literal.</summary>
    public static string ModelIdOf(string sha256) => "0x" + sha256[..8].ToUpperInvariant() + "u";
    public required string Mode { get; init; }

    /// <summary>True for the integer-only mode (the header then states formats, typedefs and limits).</summary>
    public bool IsFixed => this is CFixedFileModel;

    public required string EnergyType { get; init; }
    public required int Visible { get; init; }
    public required int Hidden { get; init; }

    public required bool HasThreshold { get; init; }
    public required string Threshold { get; init; }
    public required string ErrorBound { get; init; }

    public required int SelfTestCount { get; init; }
    public required bool HasUnitMacros { get; init; }
    public required string UnitMacros { get; init; }
}
