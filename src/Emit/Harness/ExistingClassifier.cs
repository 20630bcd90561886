using Emit.Emission;
using Emit.Quantize;

namespace Emit.Harness;

/// <summary>
/// verify's part for a classifier: <c>verify M1 M2 ... --generated DIR</c> finds the classifier's manifest, holds the
/// models given against it, regenerates the classifier and checks every file (<see cref="ClassifierSourceCheck"/>);
/// then, as for a classifier verify generates itself, model 1's scorer runs with the other scorers and the
/// classifier beside it (<see cref="Attach"/>).
/// </summary>
internal static class ExistingClassifier
{
    /// <summary>
    /// Checks the classifier in <paramref name="directory"/> for <paramref name="languages"/>: fills
    /// <paramref name="located"/> (model 1's scorer with the classifier attached) and <paramref name="checks"/>;
    /// returns the classifier as emit generates it from the models and the recorded options.
    /// </summary>
    public static CompiledClassifier Check(VerifyRequest request, string directory, IReadOnlyList<string> languages,
        Dictionary<string, ScorerSources> located, Dictionary<string, SourceCheckResult> checks)
    {
        var sources = ClassifierSources.Locate(directory, request.Name);
        var m = sources.Manifest;
        if (request.AllowModelChange)
            throw new EmitException("--allow-model-change applies to one scorer, not a classifier",
                "give the models the classifier was generated from, or regenerate it", sources.ManifestPath);
        if (request.AlarmFilter is not null)
            throw new EmitException($"classifier {m.Name} has no alarm filter",
                "leave --alarm-filter out", sources.ManifestPath);
        if (request.Numeric is { } asked && asked != m.Numeric)
            throw new EmitException(
                $"classifier {m.Name} was generated with {Setting.Numeric.Ref()} {m.Numeric.ToText()}, not " +
                $"{asked.ToText()}",
                $"pass {Setting.Numeric.Ref()} {m.Numeric.ToText()}, or leave it out to take it from the manifest",
                sources.ManifestPath);
        if (request.Fixed is { } given && given != (m.Fixed ?? new FixedPointOptions()))
            throw new EmitException(
                $"classifier {m.Name} was generated with other fixed-point options",
                "leave --weights, --accumulator and --softplus-table out to take them from the manifest",
                sources.ManifestPath);
        if (request.Priors is { } priors && (m.Priors is null || !priors.SequenceEqual(m.Priors)))
            throw new EmitException($"classifier {m.Name} was generated with other priors",
                "leave --priors out to take them from the manifest", sources.ManifestPath);
        var models = new[] { request.Model }.Concat(request.MoreModels.Select(x => x.Model)).ToArray();
        var labels = new[] { request.ModelLabel }.Concat(request.MoreModels.Select(x => x.Label)).ToArray();
        sources.CheckModels(models, labels);
        foreach (var language in languages)
            if (!m.Targets.Contains(language) || m.FilesOf(language).Count == 0)
                throw new EmitException(
                    $"classifier {m.Name} was generated for target {string.Join(",", m.Targets)}, not {language}",
                    $"regenerate it with emit compile ... --target {string.Join(",", m.Targets.Append(language)
                        .Distinct())} --name {m.Name} --out {directory}", sources.ManifestPath);
        var compiled = ClassifierSourceCheck.Regenerate(sources, models, request.TemplatesDirectory);
        foreach (var language in languages)
        {
            checks[language] = ClassifierSourceCheck.Run(sources, compiled, language);
            located[language] = Attach(sources.Directory, language, compiled);
        }
        return compiled;
    }

    /// <summary>
    /// Model 1's scorer in <paramref name="directory"/> with the classifier attached: the other models' scorers and
    /// the classifier's own sources are built beside it, and the harness runs the classifier too.
    /// </summary>
    public static ScorerSources Attach(string directory, string language, CompiledClassifier classifier)
    {
        var first = classifier.Scorers[0].Plan.Options.Name;
        var sources = ScorerSources.Locate(directory, language, first, first);
        var ext = language == "csharp" ? ".cs" : ".c";
        var companions = classifier.AllFiles
            .Where(f => !f.FileName.EndsWith(SourceManifest.Suffix, StringComparison.Ordinal)
                        && f.FileName.EndsWith(ext, StringComparison.Ordinal)
                        && !sources.Files.Any(s => Path.GetFileName(s) == f.FileName))
            .Select(f => Path.Combine(directory, f.FileName)).ToArray();
        var options = classifier.Plan.Options;
        var view = new ClassifierView(classifier.Plan, language);
        var type = options.Numeric switch
        {
            NumericMode.F32 => "float",
            NumericMode.F64 => "double",
            _ => classifier.Scorers[0].Manifest.EnergyBytes == 4 ? "int" : "long",
        };
        return sources.WithClassifier(new ClassifierHarness(options.Name,
            $"global::{options.Namespace}.{view.ClassName}", classifier.Plan.Count, type), companions);
    }
}
