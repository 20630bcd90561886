namespace Emit.Harness;

/// <summary>The comparison of one target's generated code with the reference scorer, and its verdict.</summary>
public sealed record TargetResult
{
    /// <summary>Target name (c, csharp, cortex-m3).</summary>
    public required string Target { get; init; }

    /// <summary>f64, f32 or fixed.</summary>
    public required string Numeric { get; init; }

    /// <summary>Coefficient storage: f32/f64, or int8/int16/int32 in fixed mode.</summary>
    public required string Weights { get; init; }

    /// <summary>Inputs compared (fewer than the file's when the target failed part way).</summary>
    public required long Vectors { get; init; }

    /// <summary>Largest and mean |F_generated − F_reference| in nats; null when nothing was compared.</summary>
    public double? MaxAbsError { get; init; }

    public double? MeanAbsError { get; init; }

    /// <summary>Index (from 0) of the input with the largest error.</summary>
    public long? WorstVector { get; init; }

    /// <summary>The bound the largest error is held to, nats.</summary>
    public required double ErrorBound { get; init; }

    /// <summary>How <see cref="ErrorBound"/> is derived.</summary>
    public required string ErrorBoundBasis { get; init; }

    /// <summary>Fixed mode: every result equal to the integer simulator's; null in the float modes or when nothing was compared.</summary>
    public bool? BitExact { get; init; }

    /// <summary>Fixed mode: results that differ from the simulator's.</summary>
    public long? BitMismatches { get; init; }

    /// <summary>Inputs whose decision differs from the reference decision (F &gt; threshold).</summary>
    public long DecisionMismatches { get; init; }

    /// <summary>Decision mismatches whose reference free energy lies farther from the threshold than the bound allows.</summary>
    public long UnexplainedMismatches { get; init; }

    /// <summary>Inputs where the packed and the one-byte-per-unit entry points gave different bits.</summary>
    public long EntryPointMismatches { get; init; }

    /// <summary>Failing embedded self-test vectors the generated code reported; null when it never ran.</summary>
    public int? SelfTestFailures { get; init; }

    /// <summary>"generated" (into a temporary folder by this run) or the folder of existing sources.</summary>
    public required string Sources { get; init; }

    /// <summary>The model SHA-256 stamped in the sources, or null when they carry none.</summary>
    public string? SourceModelSha256 { get; init; }

    /// <summary>True when the stamped SHA-256 equals the model's.</summary>
    public bool ModelHashMatches { get; init; }

    public required bool Passed { get; init; }

    /// <summary>Wall-clock seconds for this target: building plus scoring.</summary>
    public required double Seconds { get; init; }

    /// <summary>Seconds spent building (compiling, dotnet build).</summary>
    public double BuildSeconds { get; init; }

    /// <summary>Scoring seconds per input, including the harness's input and output (and, on the emulator, compiling each batch's image).</summary>
    public double? SecondsPerVector { get; init; }

    /// <summary>Why the target failed, one sentence each; empty when it passed.</summary>
    public required IReadOnlyList<string> Failures { get; init; }

    /// <summary>Distribution of the errors.</summary>
    public required ErrorHistogram Histogram { get; init; }
}
