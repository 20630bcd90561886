using System.Security.Cryptography;
using System.Text;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// The facts about a set of generated sources, written beside them as <c>NAME.emit.json</c> by <c>emit compile</c> and
/// <c>emit build</c> (docs/manifest.md, docs/manifest.schema.json): the tool version, the model's SHA-256, every
/// compile option, the SHA-256 of every template read and of every file written, and what a harness needs to run the
/// scorer (numeric mode, result type and scale, error bound, threshold, names). <c>emit verify --generated</c> reads
/// these facts here instead of from the text of the sources.
/// </summary>
public sealed record SourceManifest
{
    /// <summary>The value of the manifest's <c>format</c> field.</summary>
    public const string FormatName = "emit.manifest";

    /// <summary>The manifest layout version this emit writes and reads.</summary>
    public const int FormatVersion = 1;

    /// <summary>What follows the scorer name in the manifest's file name.</summary>
    public const string Suffix = ".emit.json";

    /// <summary>The manifest's file name for scorer <paramref name="name"/>: <c>NAME.emit.json</c>.</summary>
    public static string FileNameFor(string name) => name + Suffix;

    /// <summary>emit's version when it wrote the sources ("1.2.0").</summary>
    public required string ToolVersion { get; init; }

    /// <summary>The model's file name (not path), as the banners show it.</summary>
    public required string ModelFile { get; init; }

    /// <summary>The model's canonical SHA-256 (docs/model-format.md).</summary>
    public required string ModelSha256 { get; init; }

    /// <summary>rbm, lateral or general.</summary>
    public required string ModelKind { get; init; }

    /// <summary>Visible units of the model.</summary>
    public required int Visible { get; init; }

    /// <summary>Hidden units of the model.</summary>
    public required int Hidden { get; init; }

    /// <summary>
    /// The targets compiled; this and the properties down to <see cref="Fixed"/> are every compile option (a
    /// templates folder only as "custom": paths differ between machines).
    /// </summary>
    public required IReadOnlyList<string> Targets { get; init; }

    /// <summary>The numeric mode compiled.</summary>
    public required NumericMode Numeric { get; init; }

    /// <summary>The scorer name (file names and identifiers derive from it).</summary>
    public required string Name { get; init; }

    /// <summary>Namespace of the generated C#.</summary>
    public required string Namespace { get; init; }

    /// <summary>Self-test vectors compiled in.</summary>
    public required int SelfTestVectors { get; init; }

    /// <summary>The code layout the sources were generated for (manifests without it: speed, the default).</summary>
    public OptimizeFor Optimize { get; init; } = OptimizeFor.Speed;

    /// <summary>True when the sources have streamed scoring (compiled with the stream option).</summary>
    public bool Stream { get; init; }

    /// <summary>True when the sources have explanations (the explain option; implies the stream code).</summary>
    public bool Explain { get; init; }

    /// <summary>True when the sources hold the streamed-scoring API (asked for, or needed by explanations).</summary>
    public bool HasStream => Stream || Explain;

    /// <summary>True when a templates folder overrode shipped templates (<see cref="Templates"/> says which).</summary>
    public required bool CustomTemplates { get; init; }

    /// <summary>
    /// Fixed mode: the fixed-point options as given (accumulator null: chosen by emit); null in the float modes.
    /// </summary>
    public FixedPointOptions? Fixed { get; init; }

    /// <summary>The K-of-N alarm filter emitted beside the scorer, or null when there is none.</summary>
    public Emit.Detection.AlarmFilterSpec? AlarmFilter { get; init; }

    /// <summary>The type of the scorer's result: f32, f64, int32 or int64.</summary>
    public required string EnergyType { get; init; }

    /// <summary>Real free energy = result / this (1 in the float modes, 2^E in fixed mode).</summary>
    public required double EnergyScale { get; init; }

    /// <summary>How coefficients are stored: f32 or f64 in the float modes, int8/int16/int32 in fixed mode.</summary>
    public required string Weights { get; init; }

    /// <summary>Fixed mode: the accumulator type in effect (int32 or int64); null in the float modes.</summary>
    public string? Accumulator { get; init; }

    /// <summary>The bound stated in the sources: |F_generated − F_exact| ≤ this for every input (nats).</summary>
    public required double ErrorBound { get; init; }

    /// <summary>The model's threshold (nats), or null when the scorer has no decision.</summary>
    public double? Threshold { get; init; }

    /// <summary>Fixed mode: the threshold in energy units as the sources hold it; null otherwise.</summary>
    public long? ThresholdUnits { get; init; }

    /// <summary>The generated C# class (within <see cref="Namespace"/>), or null without the csharp target.</summary>
    public string? CSharpClass { get; init; }

    /// <summary>Every template read, with its SHA-256.</summary>
    public required IReadOnlyList<TemplateUse> Templates { get; init; }

    /// <summary>Every file written beside the manifest, with its SHA-256.</summary>
    public required IReadOnlyList<ManifestEntry> Files { get; init; }

    /// <summary>True when the scorer has a threshold decision (NAME_is_unusual / IsUnusual).</summary>
    public bool HasThreshold => Threshold is not null;

    /// <summary>Bytes of the scorer's result type.</summary>
    public int EnergyBytes => EnergyType is "f32" or "int32" ? 4 : 8;

    /// <summary>The files of one target, in the order written.</summary>
    public IReadOnlyList<ManifestEntry> FilesOf(string target) => Files.Where(f => f.Target == target).ToArray();

    /// <summary>
    /// The compile options the sources were generated with, for <paramref name="targets"/>; a templates folder must be
    /// given when <see cref="CustomTemplates"/> is set.
    /// </summary>
    public CompileOptions ToCompileOptions(IReadOnlyList<string> targets, string? templatesDirectory) =>
        new(targets, Numeric, Name, Namespace, SelfTestVectors, templatesDirectory,
            Numeric == NumericMode.Fixed ? Fixed ?? new FixedPointOptions() : null, Stream: Stream, Explain: Explain,
            Optimize: Optimize, AlarmFilter: AlarmFilter);

    /// <summary>The manifest for a compilation.</summary>
    internal static SourceManifest Describe(ScorerPlan plan, IReadOnlyList<string> targets,
        IReadOnlyList<(string Target, GeneratedFile File)> files, IReadOnlyList<TemplateUse> templates)
    {
        var options = plan.Options;
        var utf8 = new UTF8Encoding(false);
        var fixedPlan = plan as FixedScorerPlan;
        return new SourceManifest
        {
            ToolVersion = ScorerPlan.ToolVersion,
            ModelFile = plan.ModelLabel,
            ModelSha256 = plan.Model.Sha256,
            ModelKind = Emit.Model.ModelKindNames.ToText(plan.Model.Kind),
            Visible = plan.Visible,
            Hidden = plan.Hidden,
            Targets = targets,
            Numeric = options.Numeric,
            Name = options.Name,
            Namespace = options.Namespace,
            SelfTestVectors = options.SelfTestVectors,
            Optimize = options.Optimize,
            Stream = options.Stream,
            Explain = options.Explain,
            CustomTemplates = options.TemplatesDirectory is not null,
            Fixed = fixedPlan is null ? null : options.FixedOptions,
            AlarmFilter = options.AlarmFilter,
            EnergyType = fixedPlan is null ? options.Numeric.ToText() : fixedPlan.Accumulator.ToText(),
            EnergyScale = fixedPlan is null ? 1.0 : Math.ScaleB(1.0, fixedPlan.EnergyFractionBits),
            Weights = fixedPlan is null ? options.Numeric.ToText() : fixedPlan.WeightType.ToText(),
            Accumulator = fixedPlan?.Accumulator.ToText(),
            ErrorBound = plan.ErrorBound,
            Threshold = plan.Model.Threshold,
            ThresholdUnits = fixedPlan?.ThresholdUnits,
            CSharpClass = targets.Contains("csharp")
                ? Naming.ClassName(options.Name, Dialects.CSharpDialect.ClassMembers)
                : null,
            Templates = templates,
            Files = files.Select(f =>
            {
                var bytes = utf8.GetBytes(f.File.Text);
                var sha = Convert.ToHexStringLower(SHA256.HashData(bytes));
                return new ManifestEntry(f.Target, f.File.FileName, sha, bytes.LongLength);
            }).ToArray(),
        };
    }
}
