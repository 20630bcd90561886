using Emit.Emission;

namespace Emit.Harness;

/// <summary>
/// The strict check of an existing classifier folder (docs/verify-report.md, "Existing sources"), as
/// <see cref="SourceCheck"/> does it for one scorer: the classifier is generated again from the models with the options
/// its manifest records, and every file of a language is compared with what emit generates, line by line: the
/// classifier's own files, each model's scorer and its manifest, and the classifier's manifest. A file whose
/// SHA-256 differs from the one recorded for it is reported as edited after generation.
/// </summary>
public static class ClassifierSourceCheck
{
    /// <summary>
    /// Regenerates the classifier of <paramref name="sources"/> from <paramref name="models"/> (already checked
    /// against its manifest with <see cref="ClassifierSources.CheckModels"/>) for every target the manifest records;
    /// <paramref name="templatesDirectory"/> must be given when the manifest records custom templates.
    /// </summary>
    public static CompiledClassifier Regenerate(ClassifierSources sources,
        IReadOnlyList<Emit.Model.BoltzmannModel> models, string? templatesDirectory)
    {
        var m = sources.Manifest;
        if (m.CustomTemplates && templatesDirectory is null)
        {
            var custom = string.Join(", ", m.Templates.Where(t => t.Custom).Select(t => t.Target + "/" + t.File));
            throw new EmitException($"classifier {m.Name} was generated with custom templates ({custom})",
                "give the same templates folder (--templates DIR) so the sources can be regenerated and compared",
                sources.ManifestPath);
        }
        return ClassifierCompiler.Build(models, m.Models.Select(x => x.File).ToArray(), m.Priors,
            m.ToCompileOptions(m.Targets, m.CustomTemplates ? templatesDirectory : null));
    }

    /// <summary>Compares the files of <paramref name="language"/> with <paramref name="compiled"/>'s.</summary>
    public static SourceCheckResult Run(ClassifierSources sources, CompiledClassifier compiled, string language)
    {
        var m = sources.Manifest;
        var dir = sources.Directory;
        var failures = new List<string>();
        var edits = new List<SourceEdit>();
        var notes = SourceCheck.TemplateNotes(m.Templates, compiled.Manifest.Templates);
        void Check(string file, string want, string? recorded, string modelFile, string tool,
            IReadOnlyList<string> templateNotes)
        {
            if (SourceCheck.Compare(dir, file, want, recorded, modelFile, tool, templateNotes, edits) is { } failure)
                failures.Add(failure);
        }

        var models = string.Join(", ", m.Models.Select(x => x.File));
        var own = compiled.Files.ToDictionary(f => f.FileName, f => f.Text, StringComparer.Ordinal);
        foreach (var entry in m.FilesOf(language))
        {
            if (own.TryGetValue(entry.File, out var want)) Check(entry.File, want, entry.Sha256, models, m.ToolVersion,
                notes);
            else
                failures.Add($"{entry.File}: emit {ScorerPlan.ToolVersion} no longer generates this file with the " +
                             "recorded options; regenerate the classifier");
        }
        for (int k = 0; k < compiled.Scorers.Count; k++)
        {
            var scorer = compiled.Scorers[k];
            var recorded = m.Models[k];
            // the scorer's manifest as found: the hashes of its files (null when it cannot be read as one)
            SourceManifest? found = null;
            try { found = SourceManifestJson.ReadFile(Path.Combine(dir, recorded.Manifest)); }
            catch (EmitException) { }
            Check(scorer.ManifestFile.FileName, scorer.ManifestFile.Text, recorded.ManifestSha256, recorded.File,
                m.ToolVersion, []);
            var scorerNotes = found is null ? [] : SourceCheck.TemplateNotes(found.Templates, scorer.Templates);
            foreach (var entry in scorer.Manifest.FilesOf(language))
            {
                var text = scorer.Files.First(f => f.FileName == entry.File).Text;
                var sha = found?.FilesOf(language).FirstOrDefault(e => e.File == entry.File)?.Sha256;
                Check(entry.File, text, sha, recorded.File, found?.ToolVersion ?? m.ToolVersion, scorerNotes);
            }
        }
        // the classifier's manifest itself: regenerated from the facts it records, it must come out the same
        Check(compiled.ManifestFile.FileName, compiled.ManifestFile.Text, null, models, m.ToolVersion, notes);
        return new SourceCheckResult
        {
            ModelChanged = false, Compare = true, Failures = failures, Edits = edits, Warnings = [],
        };
    }
}
