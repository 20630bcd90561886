using System.Text.Json;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// Reads and writes <see cref="ClassifierManifest"/> as JSON (docs/manifest.md, "Classifier manifest";
/// docs/manifest.schema.json): the layout of a scorer's manifest, with a <c>classifier</c> object in place of
/// <c>model</c> and <c>scorer</c>.
/// </summary>
public static class ClassifierManifestJson
{
    /// <summary>The manifest as indented JSON with LF line ends and a final newline.</summary>
    public static string Write(ClassifierManifest m) => SourceManifestJson.Json(w =>
    {
        SourceManifestJson.WriteHead(w, m.ToolVersion);
        w.WriteStartObject("classifier");
        w.WriteStartArray("models");
        foreach (var x in m.Models)
        {
            w.WriteStartObject();
            w.WriteString("file", x.File);
            w.WriteString("sha256", x.Sha256);
            w.WriteString("kind", x.Kind);
            w.WriteNumber("visible", x.Visible);
            w.WriteNumber("hidden", x.Hidden);
            w.WriteString("scorer", x.Scorer);
            w.WriteString("manifest", x.Manifest);
            w.WriteString("manifest_sha256", x.ManifestSha256);
            w.WriteNumber("log_z", x.LogZ);
            w.WriteNumber("log_prior", x.LogPrior);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        if (m.Priors is { } priors)
        {
            w.WriteStartArray("priors");
            foreach (var p in priors) w.WriteNumberValue(p);
            w.WriteEndArray();
        }
        else w.WriteNull("priors");
        w.WriteString("energy_type", m.EnergyType);
        w.WriteNumber("energy_scale", m.EnergyScale);
        w.WriteNumber("score_bound", m.ScoreBound);
        if (m.CSharpClass is { } cls) w.WriteString("csharp_class", cls); else w.WriteNull("csharp_class");
        w.WriteEndObject();
        SourceManifestJson.WriteOptions(w, new ManifestOptions(m.Targets, m.Numeric, m.Name, m.Namespace,
            m.SelfTestVectors, m.Optimize, false, false, m.CustomTemplates, m.Fixed, null));
        SourceManifestJson.WriteTail(w, m.Templates, m.Files);
    });

    /// <summary>
    /// Reads the classifier manifest at <paramref name="path"/>; throws <see cref="EmitException"/> naming the file
    /// when it is not one.
    /// </summary>
    public static ClassifierManifest ReadFile(string path) => Read(ReadText(path), path);

    /// <summary>The manifest file's text; throws <see cref="EmitException"/> naming the file when unreadable.</summary>
    public static string ReadText(string path)
    {
        try { return File.ReadAllText(path); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new EmitException($"cannot read the manifest: {e.Message}", null, path);
        }
    }

    /// <summary>
    /// True when <paramref name="text"/> (the manifest at <paramref name="path"/>) has a <c>classifier</c> object at
    /// its top, false for a scorer's manifest; throws <see cref="EmitException"/> with line and column when it is not
    /// JSON, so that a damaged manifest is reported as such, not as a manifest of the other layout.
    /// </summary>
    public static bool IsClassifierText(string text, string path)
    {
        using var doc = SourceManifestJson.Parse(text, path);
        return doc.RootElement.ValueKind == JsonValueKind.Object
               && doc.RootElement.TryGetProperty("classifier", out _);
    }

    /// <summary>
    /// True when the file at <paramref name="path"/> is a readable classifier manifest (JSON with a
    /// <c>classifier</c> object at its top); false for anything else, for scanning a folder.
    /// </summary>
    public static bool IsClassifier(string path)
    {
        try { return IsClassifierText(File.ReadAllText(path), path); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or EmitException)
        {
            return false;
        }
    }

    /// <summary>Parses classifier manifest text; <paramref name="path"/> names it in errors.</summary>
    public static ClassifierManifest Read(string text, string path)
    {
        using var doc = SourceManifestJson.Parse(text, path);
        var r = new SourceManifestJson.Cursor(doc.RootElement, path, "");
        var tool = SourceManifestJson.ReadHead(r);
        if (!r.Has("classifier"))
            throw new EmitException("the manifest describes one scorer, not a classifier",
                "give one model to check a scorer", path);
        var c = r.Object("classifier");
        var o = SourceManifestJson.ReadOptions(r);
        var models = c.Array("models").Select(x => new ClassifierManifestModel(
            x.Text("file"), x.Text("sha256"), x.Text("kind"), x.Int("visible"), x.Int("hidden"), x.Text("scorer"),
            x.Text("manifest"), x.Text("manifest_sha256"), x.Number("log_z"), x.Number("log_prior"))).ToArray();
        if (models.Length < 2) throw r.Bad("classifier.models lists fewer than two models");
        foreach (var x in models)
            if (!Naming.IsCIdentifier(x.Scorer) || x.Manifest != SourceManifest.FileNameFor(x.Scorer))
                throw r.Bad($"classifier.models: scorer \"{Naming.CommentText(x.Scorer)}\" and its manifest " +
                            $"\"{Naming.CommentText(x.Manifest)}\" do not go together");
        return new ClassifierManifest
        {
            ToolVersion = tool,
            Models = models,
            Priors = c.Has("priors") ? c.Array("priors").Select(p => p.Value()).ToArray() : null,
            Targets = o.Targets,
            Numeric = o.Numeric,
            Name = o.Name,
            Namespace = o.Namespace,
            SelfTestVectors = o.SelfTestVectors,
            Optimize = o.Optimize,
            CustomTemplates = o.CustomTemplates,
            Fixed = o.Numeric == NumericMode.Fixed ? o.Fixed : null,
            EnergyType = c.Text("energy_type"),
            EnergyScale = c.Number("energy_scale"),
            ScoreBound = c.Number("score_bound"),
            CSharpClass = c.Has("csharp_class") ? c.Text("csharp_class") : null,
            Templates = SourceManifestJson.ReadTemplates(r),
            Files = SourceManifestJson.ReadFiles(r),
        };
    }
}
