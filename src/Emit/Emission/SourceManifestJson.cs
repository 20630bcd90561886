using System.Globalization;
using System.Text;
using System.Text.Encodings.Web;
using System.Text.Json;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// Reads and writes <see cref="SourceManifest"/> as JSON (docs/manifest.md; docs/manifest.schema.json). The text has
/// no timestamp and no paths, so regenerating the same sources gives the same bytes.
/// </summary>
public static class SourceManifestJson
{
    private const string Regenerate = "regenerate the sources with this version of emit compile (or emit build)";

    /// <summary>The manifest as indented JSON with LF line ends and a final newline.</summary>
    public static string Write(SourceManifest m) => Json(w =>
    {
        WriteHead(w, m.ToolVersion);
        w.WriteStartObject("model");
        w.WriteString("file", m.ModelFile);
        w.WriteString("sha256", m.ModelSha256);
        w.WriteString("kind", m.ModelKind);
        w.WriteNumber("visible", m.Visible);
        w.WriteNumber("hidden", m.Hidden);
        w.WriteEndObject();

        WriteOptions(w, new ManifestOptions(m.Targets, m.Numeric, m.Name, m.Namespace, m.SelfTestVectors, m.Optimize,
            m.Stream, m.Explain, m.CustomTemplates, m.Fixed, m.AlarmFilter));

        w.WriteStartObject("scorer");
        w.WriteString("energy_type", m.EnergyType);
        w.WriteNumber("energy_scale", m.EnergyScale);
        w.WriteString("weights", m.Weights);
        if (m.Accumulator is { } acc) w.WriteString("accumulator", acc); else w.WriteNull("accumulator");
        w.WriteNumber("error_bound", m.ErrorBound);
        if (m.Threshold is { } th) w.WriteNumber("threshold", th); else w.WriteNull("threshold");
        if (m.ThresholdUnits is { } tu) w.WriteNumber("threshold_units", tu); else w.WriteNull("threshold_units");
        if (m.CSharpClass is { } cls) w.WriteString("csharp_class", cls); else w.WriteNull("csharp_class");
        w.WriteEndObject();

        WriteTail(w, m.Templates, m.Files);
    });

    /// <summary>A manifest's text: one JSON object, indented, LF line ends, a final newline.</summary>
    internal static string Json(Action<Utf8JsonWriter> write)
    {
        using var buffer = new MemoryStream();
        using (var w = new Utf8JsonWriter(buffer, new JsonWriterOptions
               {
                   Indented = true,
                   NewLine = "\n",
                   Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
               }))
        {
            w.WriteStartObject();
            write(w);
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.ToArray()) + "\n";
    }

    /// <summary>The fields every manifest opens with: format, version, tool.</summary>
    internal static void WriteHead(Utf8JsonWriter w, string toolVersion)
    {
        w.WriteString("format", SourceManifest.FormatName);
        w.WriteNumber("version", SourceManifest.FormatVersion);
        w.WriteString("tool", "emit " + toolVersion);
    }

    /// <summary>The <c>options</c> object: every compile option.</summary>
    internal static void WriteOptions(Utf8JsonWriter w, ManifestOptions o)
    {
        w.WriteStartObject("options");
        w.WriteStartArray("targets");
        foreach (var t in o.Targets) w.WriteStringValue(t);
        w.WriteEndArray();
        w.WriteString("numeric", o.Numeric.ToText());
        w.WriteString("name", o.Name);
        w.WriteString("namespace", o.Namespace);
        w.WriteNumber("selftest_vectors", o.SelfTestVectors);
        w.WriteString("optimize", o.Optimize.ToText());
        w.WriteString("templates", o.CustomTemplates ? "custom" : "shipped");
        // firmware features: written only when on, so a manifest without them is unchanged
        if (o.Stream) w.WriteBoolean("stream", true);
        if (o.Explain) w.WriteBoolean("explain", true);
        if (o.Fixed is { } f)
        {
            w.WriteStartObject("fixed");
            w.WriteString("weights", f.Weights.ToText());
            w.WriteString("accumulator", f.Accumulator is { } a ? a.ToText() : "auto");
            w.WriteNumber("softplus_table", f.SoftplusTableSize);
            // a classifier's models share one energy format (written only when set)
            if (f.EnergyFractionBitsLimit is { } limit) w.WriteNumber("energy_fraction_bits_limit", limit);
            w.WriteEndObject();
        }
        else w.WriteNull("fixed");
        // written only when given, so the manifests of scorers without the filter stay as they were
        if (o.AlarmFilter is { } filter) w.WriteString("alarm_filter", filter.ToString());
        w.WriteEndObject();
    }

    /// <summary>The fields every manifest closes with: the templates read and the files written.</summary>
    internal static void WriteTail(Utf8JsonWriter w, IReadOnlyList<TemplateUse> templates,
        IReadOnlyList<ManifestEntry> files)
    {
        w.WriteStartArray("templates");
        foreach (var t in templates)
        {
            w.WriteStartObject();
            w.WriteString("target", t.Target);
            w.WriteString("file", t.File);
            w.WriteString("origin", t.Custom ? "custom" : "shipped");
            w.WriteString("sha256", t.Sha256);
            w.WriteEndObject();
        }
        w.WriteEndArray();

        w.WriteStartArray("files");
        foreach (var e in files)
        {
            w.WriteStartObject();
            w.WriteString("target", e.Target);
            w.WriteString("file", e.File);
            w.WriteString("sha256", e.Sha256);
            w.WriteNumber("bytes", e.Bytes);
            w.WriteEndObject();
        }
        w.WriteEndArray();
    }

    /// <summary>
    /// Reads the manifest file at <paramref name="path"/>; throws <see cref="EmitException"/> naming the file when it
    /// is not one.
    /// </summary>
    public static SourceManifest ReadFile(string path)
    {
        string text;
        try { text = File.ReadAllText(path); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new EmitException($"cannot read the manifest: {e.Message}", null, path);
        }
        return Read(text, path);
    }

    /// <summary>Parses manifest text; <paramref name="path"/> names it in errors.</summary>
    public static SourceManifest Read(string text, string path)
    {
        using var doc = Parse(text, path);
        var r = new Cursor(doc.RootElement, path, "");
        var tool = ReadHead(r);
        if (r.Has("classifier"))
        {
            int count = r.Object("classifier").Array("models").Count;
            var name = r.Object("options").Text("name");
            throw new EmitException(
                $"{Naming.CommentText(name)} is not one scorer: the manifest describes a classifier over " +
                $"{count} models",
                $"give all {count} of its models, in the manifest's order, to check it as a classifier " +
                $"(or {Setting.Name.Ref()} {Naming.CommentText(name)}_k with one model for one of its scorers)", path);
        }
        var model = r.Object("model");
        var o = ReadOptions(r);
        var scorer = r.Object("scorer");
        return new SourceManifest
        {
            ToolVersion = tool,
            ModelFile = model.Text("file"),
            ModelSha256 = model.Text("sha256"),
            ModelKind = model.Text("kind"),
            Visible = model.Int("visible"),
            Hidden = model.Int("hidden"),
            Targets = o.Targets,
            Numeric = o.Numeric,
            Name = o.Name,
            Namespace = o.Namespace,
            SelfTestVectors = o.SelfTestVectors,
            Optimize = o.Optimize,
            Stream = o.Stream,
            Explain = o.Explain,
            CustomTemplates = o.CustomTemplates,
            Fixed = o.Fixed,
            AlarmFilter = o.AlarmFilter,
            EnergyType = scorer.Text("energy_type"),
            EnergyScale = scorer.Number("energy_scale"),
            Weights = scorer.Text("weights"),
            Accumulator = scorer.Has("accumulator") ? scorer.Text("accumulator") : null,
            ErrorBound = scorer.Number("error_bound"),
            Threshold = scorer.Has("threshold") ? scorer.Number("threshold") : null,
            ThresholdUnits = scorer.Has("threshold_units") ? scorer.Long("threshold_units") : null,
            CSharpClass = scorer.Has("csharp_class") ? scorer.Text("csharp_class") : null,
            Templates = ReadTemplates(r),
            Files = ReadFiles(r),
        };
    }

    /// <summary>Manifest text as a JSON document; throws <see cref="EmitException"/> naming the file.</summary>
    internal static JsonDocument Parse(string text, string path)
    {
        try { return JsonDocument.Parse(text); }
        catch (JsonException e)
        {
            throw new EmitException($"the manifest is not valid JSON: {e.Message}", Regenerate, path,
                e.LineNumber + 1, e.BytePositionInLine + 1);
        }
    }

    /// <summary>Checks format and version; returns the emit version that wrote the manifest.</summary>
    internal static string ReadHead(Cursor r)
    {
        if (r.Text("format") != SourceManifest.FormatName)
            throw r.Bad($"not an emit manifest (format \"{Naming.CommentText(r.Text("format"))}\")");
        int version = r.Int("version");
        if (version != SourceManifest.FormatVersion)
            throw r.Bad(
                $"manifest version {version} is not the version {SourceManifest.FormatVersion} this emit reads");
        var tool = r.Text("tool");
        return tool.StartsWith("emit ", StringComparison.Ordinal) ? tool[5..] : tool;
    }

    /// <summary>The <c>options</c> object of the manifest at <paramref name="r"/>.</summary>
    internal static ManifestOptions ReadOptions(Cursor r)
    {
        var options = r.Object("options");
        var numericText = options.Text("numeric");
        var numeric = NumericModeNames.Parse(numericText)
                      ?? throw r.Bad($"options.numeric \"{Naming.CommentText(numericText)}\" is unknown");
        return new ManifestOptions(
            options.Array("targets").Select(t => t.String()).ToArray(),
            numeric,
            options.Text("name"),
            options.Text("namespace"),
            options.Int("selftest_vectors"),
            options.Has("optimize")
                ? OptimizeForNames.Parse(options.Text("optimize"))
                  ?? throw r.Bad("options.optimize is not speed or size")
                : OptimizeFor.Speed,
            options.Has("stream") && options.Bool("stream"),
            options.Has("explain") && options.Bool("explain"),
            options.Text("templates") switch
            {
                "custom" => true,
                "shipped" => false,
                _ => throw r.Bad("options.templates is not shipped or custom"),
            },
            options.Has("fixed") ? ReadFixed(options.Object("fixed")) : null,
            options.Has("alarm_filter") ? ReadFilter(options) : null);
    }

    /// <summary>The <c>templates</c> array.</summary>
    internal static IReadOnlyList<TemplateUse> ReadTemplates(Cursor r) =>
        r.Array("templates")
            .Select(t => new TemplateUse(t.Text("target"), t.Text("file"), t.Text("origin") == "custom",
                t.Text("sha256")))
            .ToArray();

    /// <summary>The <c>files</c> array.</summary>
    internal static IReadOnlyList<ManifestEntry> ReadFiles(Cursor r) =>
        r.Array("files")
            .Select(e => new ManifestEntry(e.Text("target"), e.Text("file"), e.Text("sha256"), e.Long("bytes")))
            .ToArray();

    private static Emit.Detection.AlarmFilterSpec ReadFilter(Cursor options)
    {
        try { return Emit.Detection.AlarmFilterSpec.Parse(options.Text("alarm_filter")); }
        catch (EmitException e) { throw options.Bad($"options.alarm_filter: {e.Problem}"); }
    }

    private static FixedPointOptions ReadFixed(Cursor f)
    {
        var weights = WeightTypeInfo.Parse(f.Text("weights"))
                      ?? throw f.Bad("options.fixed.weights is not int8, int16 or int32");
        var text = f.Text("accumulator");
        AccumulatorType? accumulator = text == "auto"
            ? null
            : AccumulatorTypeInfo.Parse(text) ?? throw f.Bad("options.fixed.accumulator is not auto, int32 or int64");
        return new FixedPointOptions(weights, accumulator, f.Int("softplus_table"),
            f.Has("energy_fraction_bits_limit") ? f.Int("energy_fraction_bits_limit") : null);
    }

    /// <summary>A JSON value being read, with the path of its fields for messages.</summary>
    internal readonly struct Cursor(JsonElement value, string file, string at)
    {
        public EmitException Bad(string problem) => new($"manifest: {problem}", Regenerate, file);

        private string Where(string name) =>
            at.Length == 0 ? (name.Length == 0 ? "the top level" : name) : name.Length == 0 ? at : at + "." + name;

        private JsonElement Get(string name)
        {
            if (value.ValueKind != JsonValueKind.Object) throw Bad($"{Where("")} is not an object");
            if (!value.TryGetProperty(name, out var v)) throw Bad($"field {Where(name)} is missing");
            return v;
        }

        public bool Has(string name) =>
            value.ValueKind == JsonValueKind.Object && value.TryGetProperty(name, out var v)
                                                    && v.ValueKind != JsonValueKind.Null;

        private EmitException Not(string name, string what) => Bad($"field {Where(name)} is not {what}");

        public double Value() =>
            value.ValueKind == JsonValueKind.Number ? value.GetDouble() : throw Bad($"{Where("")} is not a number");

        public string String() =>
            value.ValueKind == JsonValueKind.String ? value.GetString()! : throw Bad($"{Where("")} is not a string");

        public string Text(string name)
        {
            var v = Get(name);
            return v.ValueKind == JsonValueKind.String ? v.GetString()! : throw Not(name, "a string");
        }

        public int Int(string name)
        {
            var v = Get(name);
            return v.ValueKind == JsonValueKind.Number && v.TryGetInt32(out int n) ? n : throw Not(name, "an integer");
        }

        public long Long(string name)
        {
            var v = Get(name);
            return v.ValueKind == JsonValueKind.Number && v.TryGetInt64(out long n) ? n : throw Not(name, "an integer");
        }

        public bool Bool(string name)
        {
            var v = Get(name);
            return v.ValueKind switch
            {
                JsonValueKind.True => true,
                JsonValueKind.False => false,
                _ => throw Not(name, "true or false"),
            };
        }

        public double Number(string name)
        {
            var v = Get(name);
            return v.ValueKind == JsonValueKind.Number ? v.GetDouble() : throw Not(name, "a number");
        }

        public Cursor Object(string name)
        {
            var v = Get(name);
            return v.ValueKind == JsonValueKind.Object
                ? new Cursor(v, file, Where(name))
                : throw Not(name, "an object");
        }

        public IReadOnlyList<Cursor> Array(string name)
        {
            var v = Get(name);
            if (v.ValueKind != JsonValueKind.Array) throw Not(name, "an array");
            var (f, w) = (file, Where(name));
            return v.EnumerateArray()
                .Select((e, k) => new Cursor(e, f, $"{w}[{k.ToString(CultureInfo.InvariantCulture)}]"))
                .ToArray();
        }
    }
}
