using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Harness;

/// <summary>What <c>emit verify</c> was asked to do.</summary>
public sealed record VerifyRequest
{
    /// <summary>The model whose generated code is verified.</summary>
    public required BoltzmannModel Model { get; init; }

    /// <summary>The model's file name (not path): names it in reports and gives the default scorer name.</summary>
    public required string ModelLabel { get; init; }

    /// <summary>Vector file, or <c>-</c> for <see cref="Stdin"/>.</summary>
    public required string InputPath { get; init; }

    /// <summary>Standard input, read when <see cref="InputPath"/> is <c>-</c>.</summary>
    public Stream? Stdin { get; init; }

    /// <summary>Target names from <see cref="Runners"/>.</summary>
    public required IReadOnlyList<string> Targets { get; init; }

    /// <summary>Numeric mode; null: the one stamped in existing sources, else f32 (emit compile's default).</summary>
    public NumericMode? Numeric { get; init; }

    /// <summary>Fixed-point options; null: those stamped in existing sources, else the defaults.</summary>
    public FixedPointOptions? Fixed { get; init; }

    /// <summary>
    /// The K-of-N alarm filter to emit beside the scorer and check; null: the one recorded in existing sources'
    /// manifest, else none.
    /// </summary>
    public Emit.Detection.AlarmFilterSpec? AlarmFilter { get; init; }

    /// <summary>
    /// Several models make a classifier (models 2 and up and the priors; <see cref="Model"/> is model 1): verify
    /// generates it, checks model 1's scorer as usual and the classifier's indices and scores beside it.
    /// </summary>
    public IReadOnlyList<(BoltzmannModel Model, string Label)> MoreModels { get; init; } = [];

    /// <summary>The classifier's prior weights, one per model (null: equal).</summary>
    public IReadOnlyList<double>? Priors { get; init; }

    /// <summary>Folder of existing generated sources to check; null: generate into the work folder.</summary>
    public string? GeneratedDirectory { get; init; }

    /// <summary>
    /// Scorer name; null: the one found in <see cref="GeneratedDirectory"/>, or the model file's name made an
    /// identifier.
    /// </summary>
    public string? Name { get; init; }

    /// <summary>Sources generated here: also emit and check streamed scoring (sources given: their manifest says).
    /// </summary>
    public bool Stream { get; init; }

    /// <summary>Sources generated here: also emit and check explanations (implies the stream code).</summary>
    public bool Explain { get; init; }

    /// <summary>
    /// With <see cref="GeneratedDirectory"/>: compare the numbers even when the sources were generated from another
    /// model (otherwise such sources fail without being run).
    /// </summary>
    public bool AllowModelChange { get; init; }

    /// <summary>
    /// Fail a target on any decision that differs from the reference, even one the error bound explains.
    /// </summary>
    public bool FailOnDecisionMismatch { get; init; }

    /// <summary>
    /// The templates folder of sources generated with custom templates (needed to regenerate and compare them).
    /// </summary>
    public string? TemplatesDirectory { get; init; }

    /// <summary>Tool paths and time limits for the runners.</summary>
    public RunnerSettings Settings { get; init; } = new();

    /// <summary>Where to build; null: a temporary folder deleted afterwards.</summary>
    public string? WorkDirectory { get; init; }

    /// <summary>Inputs read, scored by the reference and sent to every target per step.</summary>
    public int BatchRows { get; init; } = 4096;
}
