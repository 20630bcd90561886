namespace Emit.Harness;

/// <summary>Everything <c>emit verify</c> found: the model, the input, one result per target, and warnings.</summary>
public sealed record VerifyReport
{
    /// <summary>emit's version.</summary>
    public required string ToolVersion { get; init; }

    /// <summary>The model's file name (not path).</summary>
    public required string Model { get; init; }

    /// <summary>SHA-256 of the model verified.</summary>
    public required string ModelSha256 { get; init; }

    /// <summary>
    /// For a classifier, every model in class order (file name, SHA-256), the first being <see cref="Model"/>, whose
    /// scorer the per-target figures describe; the classifier's own results are the targets' features. Empty for one
    /// scorer.
    /// </summary>
    public IReadOnlyList<(string File, string Sha256)> ClassifierModels { get; init; } = [];

    /// <summary>The vector file's name as given.</summary>
    public required string Input { get; init; }

    /// <summary>Inputs read from the vector file.</summary>
    public required long Vectors { get; init; }

    /// <summary>The model's threshold, or null.</summary>
    public double? Threshold { get; init; }

    /// <summary>One result per target.</summary>
    public required IReadOnlyList<TargetResult> Targets { get; init; }

    /// <summary>Things worth knowing that do not fail a target (a model hash differing from the stamped one).</summary>
    public required IReadOnlyList<string> Warnings { get; init; }

    /// <summary>Whether sources of another model were compared all the same instead of failing.</summary>
    public bool AllowModelChange { get; init; }

    /// <summary>Whether any decision differing from the reference failed a target, even within the bound.</summary>
    public bool FailOnDecisionMismatch { get; init; }

    /// <summary>True when every target passed.</summary>
    public bool Passed => Targets.Count > 0 && Targets.All(t => t.Passed);

    /// <summary>The caution printed with every report.</summary>
    public const string Caution =
        "A monitoring aid, not a safety function: this report compares generated code with the reference scorer; it " +
        "does not " +
        "show that the model detects what matters for the plant. Defer to local codes and licensed practice.";
}
