using System.Security.Cryptography;
using System.Text;
using Emit.Emission;
using Emit.Model;

namespace Emit.Harness;

/// <summary>
/// The strict check of existing sources against their manifest (docs/manifest.md, docs/verify-report.md): the
/// sources must come from the model given, and every file must be exactly what emit generates today from that model
/// with the manifest's options and templates. This catches a hand edit too small for any numeric comparison to see
/// (a weight changed by less than the error bound) and sources of an older emit.
/// </summary>
public static class SourceCheck
{
    private const int MaxLineText = 100;

    /// <summary>
    /// Checks <paramref name="sources"/> against <paramref name="model"/> (named <paramref name="modelLabel"/>).
    /// With <paramref name="allowModelChange"/>, sources of another model are compared all the same, and edits are
    /// found from the manifest's file hashes alone. <paramref name="templatesDirectory"/> is the templates folder of
    /// sources generated with custom templates; throws <see cref="EmitException"/> when it is needed and missing.
    /// </summary>
    public static SourceCheckResult Run(ScorerSources sources, BoltzmannModel model, string modelLabel,
        bool allowModelChange, string? templatesDirectory)
    {
        var m = sources.Manifest;
        var names = string.Join(", ", sources.Files.Select(Path.GetFileName));
        if (m.ModelSha256 == model.Sha256) return Regenerate(sources, model, templatesDirectory);
        if (!allowModelChange)
        {
            var failure = $"{names} were generated from model sha256 {m.ModelSha256} " +
                          $"({Naming.CommentText(m.ModelFile)}), " +
                          $"but {modelLabel} has sha256 {model.Sha256}: regenerate the sources from this model " +
                          "(or allow a model change, --allow-model-change, to compare the numbers all the same)";
            return Result(modelChanged: true, compare: false, [failure], [], []);
        }
        var failures = new List<string>();
        var edits = new List<SourceEdit>();
        foreach (var entry in m.FilesOf(sources.Language))
        {
            if (HashOf(Path.Combine(sources.Directory, entry.File)) == entry.Sha256) continue;
            edits.Add(new SourceEdit(entry.File, null, null, null, false));
            failures.Add($"{entry.File}: edited after generation (its SHA-256 differs from the manifest's; the first " +
                         "differing line is unknown, as the model it was generated from is not at hand)");
        }
        var warning = $"{names}: generated from model {m.ModelSha256}, but {modelLabel} is {model.Sha256}; " +
                      "the numbers are compared all the same";
        return Result(modelChanged: true, compare: true, failures, edits, [warning]);
    }

    private static SourceCheckResult Result(bool modelChanged, bool compare, IReadOnlyList<string> failures,
        IReadOnlyList<SourceEdit> edits, IReadOnlyList<string> warnings) =>
        new()
        {
            ModelChanged = modelChanged, Compare = compare, Failures = failures, Edits = edits, Warnings = warnings,
        };

    /// <summary>Generates the sources again with the manifest's options and templates; compares every file.</summary>
    private static SourceCheckResult Regenerate(ScorerSources sources, BoltzmannModel model,
        string? templatesDirectory)
    {
        var m = sources.Manifest;
        if (m.CustomTemplates && templatesDirectory is null)
        {
            var custom = string.Join(", ", m.Templates.Where(t => t.Custom).Select(t => t.Target + "/" + t.File));
            var names = string.Join(", ", sources.Files.Select(Path.GetFileName));
            throw new EmitException($"{names} were generated with custom templates ({custom})",
                "give the same templates folder (--templates DIR) so the sources can be regenerated and compared",
                sources.ManifestPath);
        }
        var options = m.ToCompileOptions([sources.Language], m.CustomTemplates ? templatesDirectory : null);
        var compiled = ScorerCompiler.Build(model, m.ModelFile, options);
        var notes = TemplateNotes(m.Templates, compiled.Templates);
        var expected = compiled.Files.ToDictionary(f => f.FileName, f => f.Text, StringComparer.Ordinal);
        var recorded = m.FilesOf(sources.Language);
        var failures = new List<string>();
        var edits = new List<SourceEdit>();
        foreach (var entry in recorded)
        {
            if (!expected.TryGetValue(entry.File, out var want))
            {
                failures.Add($"{entry.File}: emit {ScorerPlan.ToolVersion} no longer generates this file with the " +
                             "recorded options; regenerate the sources");
                continue;
            }
            if (Compare(sources.Directory, entry.File, want, entry.Sha256, m.ModelFile, m.ToolVersion, notes, edits)
                is { } failure)
                failures.Add(failure);
        }
        foreach (var name in expected.Keys.Where(n => recorded.All(e => e.File != n)))
            failures.Add($"{name}: emit {ScorerPlan.ToolVersion} generates this file, but the manifest does not " +
                         "list it; regenerate the sources");
        return Result(modelChanged: false, compare: true, failures, edits, []);
    }

    /// <summary>
    /// Compares the file <paramref name="file"/> in <paramref name="directory"/> with the text emit generates for it
    /// (<paramref name="want"/>); returns null when they are equal, else the failure sentence, and notes the edit.
    /// <paramref name="recordedSha256"/> is the file's hash as its manifest records it (null: none recorded), telling
    /// a hand edit from a change of emit's output; <paramref name="modelFile"/> and <paramref name="toolVersion"/>
    /// (the emit that wrote the sources) name what the sources were generated from.
    /// </summary>
    internal static string? Compare(string directory, string file, string want, string? recordedSha256,
        string modelFile, string toolVersion, IReadOnlyList<string> templateNotes, List<SourceEdit> edits)
    {
        var path = Path.Combine(directory, file);
        string found;
        // decoded without dropping a byte-order mark, so every byte counts
        try { found = new UTF8Encoding(false).GetString(File.ReadAllBytes(path)); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new EmitException($"cannot read: {e.Message}", null, path);
        }
        if (want == found) return null;
        bool asWritten = recordedSha256 is not null && HashOf(path) == recordedSha256;
        var (line, wantLine, foundLine) = FirstDifference(want, found);
        edits.Add(new SourceEdit(file, line, wantLine, foundLine, asWritten));
        bool onlyLineEnds = found.Replace("\r\n", "\n", StringComparison.Ordinal) == want;
        return Describe(file, (line, wantLine, foundLine), asWritten, onlyLineEnds, modelFile, toolVersion,
            templateNotes);
    }

    /// <summary>One sentence for a file that differs.</summary>
    private static string Describe(string file, (int Line, string? Want, string? Found) at, bool asWritten,
        bool onlyLineEnds, string modelFile, string toolVersion, IReadOnlyList<string> templateNotes)
    {
        var (line, wantLine, foundLine) = at;
        if (onlyLineEnds)
            return $"{file}: line ends changed to CRLF after generation (a checkout converting line ends?), " +
                   $"first at line {line}; emit writes LF: keep the file as written " +
                   "(e.g. a .gitattributes line '* -text' for the folder)";
        var where = $"line {line}: emit generates {Quote(wantLine)}, the file has {Quote(foundLine)}";
        if (!asWritten) return $"{file}: edited after generation; first difference at {where}";
        var notes = templateNotes.Count > 0 ? "; " + string.Join("; ", templateNotes) : "";
        return $"{file}: not what emit {ScorerPlan.ToolVersion} generates from {Naming.CommentText(modelFile)} " +
               $"with the recorded options (the sources were written by emit {toolVersion}{notes}); " +
               $"first difference at {where}; regenerate the sources";
    }

    /// <summary>Templates read now that differ from those the manifest records.</summary>
    internal static IReadOnlyList<string> TemplateNotes(IReadOnlyList<TemplateUse> recordedTemplates,
        IReadOnlyList<TemplateUse> used)
    {
        var notes = new List<string>();
        foreach (var u in used)
        {
            var recorded = recordedTemplates.FirstOrDefault(t => t.Target == u.Target && t.File == u.File);
            if (recorded is null) notes.Add($"{u.Target}/{u.File} is new");
            else if (recorded.Sha256 != u.Sha256 || recorded.Custom != u.Custom)
                notes.Add($"{u.Target}/{u.File} ({(u.Custom ? "custom" : "shipped")}) differs from the one used");
        }
        return notes;
    }

    /// <summary>The first line (from 1) where two texts differ, with both lines (null past a text's end).</summary>
    internal static (int Line, string? Expected, string? Found) FirstDifference(string expected, string found)
    {
        var a = expected.Split('\n');
        var b = found.Split('\n');
        int n = Math.Max(a.Length, b.Length);
        for (int k = 0; k < n; k++)
        {
            string? x = k < a.Length ? a[k] : null, y = k < b.Length ? b[k] : null;
            if (x != y) return (k + 1, x, y);
        }
        return (n, null, null);
    }

    private static string Quote(string? line) =>
        line is null
            ? "nothing (end of file)"
            : "\"" + (line.Length > MaxLineText ? line[..MaxLineText] + "..." : line).Trim() + "\"";

    internal static string HashOf(string path)
    {
        try
        {
            using var s = File.OpenRead(path);
            return Convert.ToHexStringLower(SHA256.HashData(s));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new EmitException($"cannot read: {e.Message}", null, path);
        }
    }
}
