using System.Security.Cryptography;
using System.Text;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// The facts about a generated classifier, written beside its files as <c>NAME.emit.json</c> by <c>emit compile M1 M2
/// ... --name NAME</c> and <c>emit build</c> (docs/manifest.md, "Classifier manifest"): the tool version, each model's
/// file name, SHA-256, log Z and log prior with the name and manifest hash of its scorer, the priors as given, every
/// compile option, the templates read and the classifier's own files with their SHA-256. <c>emit verify M1 M2 ...
/// --generated DIR</c> regenerates the classifier from these facts and the models given, and compares every file.
/// Like a scorer's manifest it has no timestamp and no paths (model files by name only).
/// </summary>
public sealed record ClassifierManifest
{
    /// <summary>emit's version when it wrote the sources.</summary>
    public required string ToolVersion { get; init; }

    /// <summary>The models in class order (class k is <c>Models[k]</c>).</summary>
    public required IReadOnlyList<ClassifierManifestModel> Models { get; init; }

    /// <summary>The prior weights as given (one per model), or null for equal priors.</summary>
    public IReadOnlyList<double>? Priors { get; init; }

    /// <summary>The targets compiled.</summary>
    public required IReadOnlyList<string> Targets { get; init; }

    /// <summary>The numeric mode compiled (the same for every model).</summary>
    public required NumericMode Numeric { get; init; }

    /// <summary>The classifier's name (its files NAME.h, NAME.c, NAME.cs; its models' scorers NAME_1, NAME_2, ...).
    /// </summary>
    public required string Name { get; init; }

    /// <summary>Namespace of the generated C#.</summary>
    public required string Namespace { get; init; }

    /// <summary>Self-test vectors compiled into each model's scorer.</summary>
    public required int SelfTestVectors { get; init; }

    /// <summary>The code layout.</summary>
    public OptimizeFor Optimize { get; init; } = OptimizeFor.Speed;

    /// <summary>True when a templates folder overrode shipped templates.</summary>
    public required bool CustomTemplates { get; init; }

    /// <summary>Fixed mode: the fixed-point options as given; null in the float modes.</summary>
    public FixedPointOptions? Fixed { get; init; }

    /// <summary>The type of a score: f32, f64, int32 or int64.</summary>
    public required string EnergyType { get; init; }

    /// <summary>Real score = score / this (1 in the float modes, 2^E in fixed mode).</summary>
    public required double EnergyScale { get; init; }

    /// <summary>|score_k − exact score_k| ≤ this for every input and k (nats), as the sources state it.</summary>
    public required double ScoreBound { get; init; }

    /// <summary>The generated C# class (within <see cref="Namespace"/>), or null without the csharp target.</summary>
    public string? CSharpClass { get; init; }

    /// <summary>The classifier templates read, with their SHA-256.</summary>
    public required IReadOnlyList<TemplateUse> Templates { get; init; }

    /// <summary>The classifier's own files (not its models' scorers), with their SHA-256.</summary>
    public required IReadOnlyList<ManifestEntry> Files { get; init; }

    /// <summary>The classifier's own files of one target, in the order written.</summary>
    public IReadOnlyList<ManifestEntry> FilesOf(string target) => Files.Where(f => f.Target == target).ToArray();

    /// <summary>
    /// The compile options the classifier was generated with, for <paramref name="targets"/>; a templates folder must
    /// be given when <see cref="CustomTemplates"/> is set.
    /// </summary>
    public CompileOptions ToCompileOptions(IReadOnlyList<string> targets, string? templatesDirectory) =>
        new(targets, Numeric, Name, Namespace, SelfTestVectors, templatesDirectory,
            Numeric == NumericMode.Fixed ? Fixed ?? new FixedPointOptions() : null, Optimize);

    /// <summary>The manifest of a compiled classifier.</summary>
    internal static ClassifierManifest Describe(ClassifierPlan plan, IReadOnlyList<CompiledScorer> scorers,
        IReadOnlyList<double>? priors, IReadOnlyList<(string Target, GeneratedFile File)> files,
        IReadOnlyList<TemplateUse> templates)
    {
        var options = plan.Options;
        var first = scorers[0].Manifest;
        return new ClassifierManifest
        {
            ToolVersion = ScorerPlan.ToolVersion,
            Models = scorers.Select((s, k) => new ClassifierManifestModel(
                s.Manifest.ModelFile, s.Manifest.ModelSha256, s.Manifest.ModelKind, s.Manifest.Visible,
                s.Manifest.Hidden, s.Manifest.Name, s.ManifestFile.FileName, Hash(s.ManifestFile.Text).Sha256,
                plan.LogZ[k], plan.LogPriors[k])).ToArray(),
            Priors = priors?.ToArray(),
            Targets = options.Targets.Distinct().ToArray(),
            Numeric = options.Numeric,
            Name = options.Name,
            Namespace = options.Namespace,
            SelfTestVectors = options.SelfTestVectors,
            Optimize = options.Optimize,
            CustomTemplates = options.TemplatesDirectory is not null,
            Fixed = options.Numeric == NumericMode.Fixed ? options.FixedOptions : null,
            EnergyType = first.EnergyType,
            EnergyScale = first.EnergyScale,
            ScoreBound = plan.ScoreBound,
            CSharpClass = options.Targets.Contains("csharp")
                ? Naming.ClassName(options.Name, ClassifierView.Members)
                : null,
            Templates = templates,
            Files = files.Select(f =>
            {
                var (sha, bytes) = Hash(f.File.Text);
                return new ManifestEntry(f.Target, f.File.FileName, sha, bytes);
            }).ToArray(),
        };
    }

    /// <summary>SHA-256 (lower-case hex) and length of a text's UTF-8 bytes, as written.</summary>
    private static (string Sha256, long Bytes) Hash(string text)
    {
        var bytes = new UTF8Encoding(false).GetBytes(text);
        return (Convert.ToHexStringLower(SHA256.HashData(bytes)), bytes.LongLength);
    }
}
