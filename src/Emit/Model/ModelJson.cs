using System.Collections.Immutable;
using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;

namespace Emit.Model;

/// <summary>
/// Reads and writes the model file format version 1 (<c>"format": "emit.model"</c>); see docs/model-format.md.
/// Errors name the line and column of the offending token.
/// </summary>
public static class ModelJson
{
    /// <summary>The "format" value of a model file.</summary>
    public const string FormatName = "emit.model";
    /// <summary>The model file format version this reader and writer use.</summary>
    public const int FormatVersion = 1;

    /// <summary>Largest model file accepted (bytes).</summary>
    public const long MaxFileBytes = 2L * 1024 * 1024 * 1024 - 1;

    /// <summary>Reads a model JSON file; errors carry <paramref name="path"/>.</summary>
    public static BoltzmannModel Read(string path) =>
        Parse(JsonCursor.ReadFile(path, MaxFileBytes, "a model file"), path);

    /// <summary>Parses model JSON from UTF-8 bytes (a leading byte-order mark is accepted).</summary>
    public static BoltzmannModel Parse(ReadOnlySpan<byte> utf8, string source)
    {
        var parser = new Parser(JsonCursor.Content(utf8, source, "a JSON model object"), source);
        return parser.ParseModel();
    }

    /// <summary>Writes the model as readable JSON (one weight row per line), metadata included.</summary>
    public static string ToText(BoltzmannModel model) => Write(model, pretty: true, includeMetadata: true);

    /// <summary>
    /// The canonical serialisation: compact, fixed key order, shortest round-trip numbers, no metadata.
    /// </summary>
    public static string Canonical(BoltzmannModel model) => Write(model, pretty: false, includeMetadata: false);

    internal static string CanonicalSha256(BoltzmannModel model) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(Canonical(model))));

    /// <summary>Writes the model to <paramref name="path"/> atomically (temporary file, then rename).</summary>
    public static void WriteFile(BoltzmannModel model, string path, bool force) =>
        AtomicFile.WriteAllText(path, ToText(model), force);

    /// <summary>Shortest text that parses back to the same double, invariant culture.</summary>
    public static string Number(double d) => d.ToString("R", CultureInfo.InvariantCulture);

    private static string Write(BoltzmannModel m, bool pretty, bool includeMetadata)
    {
        var sb = new StringBuilder();
        string nl = pretty ? "\n" : "";
        string ind = pretty ? "  " : "";
        string sep = pretty ? ", " : ",";
        string colon = pretty ? ": " : ":";
        bool first = true;
        void Key(string k)
        {
            if (!first) sb.Append(',');
            first = false;
            sb.Append(nl).Append(ind).Append('"').Append(k).Append('"').Append(colon);
        }
        void Numbers(ReadOnlySpan<double> xs)
        {
            sb.Append('[');
            for (int i = 0; i < xs.Length; i++)
            {
                if (i > 0) sb.Append(sep);
                sb.Append(Number(xs[i]));
            }
            sb.Append(']');
        }
        void Links(ImmutableArray<Link> links)
        {
            sb.Append('[');
            for (int k = 0; k < links.Length; k++)
            {
                if (k > 0) sb.Append(',');
                sb.Append(nl).Append(ind).Append(ind);
                var l = links[k];
                sb.Append('[').Append(l.I.ToString(CultureInfo.InvariantCulture)).Append(sep)
                  .Append(l.J.ToString(CultureInfo.InvariantCulture)).Append(sep).Append(Number(l.W)).Append(']');
            }
            if (links.Length > 0) sb.Append(nl).Append(ind);
            sb.Append(']');
        }

        sb.Append('{');
        Key("format"); sb.Append('"').Append(FormatName).Append('"');
        Key("version"); sb.Append(FormatVersion);
        Key("kind"); sb.Append('"').Append(m.Kind.ToText()).Append('"');
        Key("visible"); sb.Append(m.Visible.ToString(CultureInfo.InvariantCulture));
        Key("hidden"); sb.Append(m.Hidden.ToString(CultureInfo.InvariantCulture));
        if (!m.Names.IsEmpty)
        {
            Key("names");
            sb.Append('[');
            for (int i = 0; i < m.Names.Length; i++)
            {
                if (i > 0) sb.Append(sep);
                sb.Append('"').Append(JsonEncodedText.Encode(m.Names[i]).Value).Append('"');
            }
            sb.Append(']');
        }
        Key("visible_bias"); Numbers(m.VisibleBias.AsSpan());
        Key("hidden_bias"); Numbers(m.HiddenBias.AsSpan());
        Key("weights");
        sb.Append('[');
        for (int i = 0; i < m.Visible; i++)
        {
            if (i > 0) sb.Append(',');
            sb.Append(nl).Append(ind).Append(ind);
            Numbers(m.WeightRow(i));
        }
        sb.Append(nl).Append(ind).Append(']');
        if (m.Kind != ModelKind.Rbm) { Key("visible_links"); Links(m.VisibleLinks); }
        if (m.Kind == ModelKind.General) { Key("hidden_links"); Links(m.HiddenLinks); }
        if (m.Threshold is { } t) { Key("threshold"); sb.Append(Number(t)); }
        if (m.LogPartition is { } lp)
        {
            Key("log_partition");
            sb.Append("{\"value\"").Append(colon).Append(Number(lp.Value)).Append(sep)
              .Append("\"method\"").Append(colon).Append('"').Append(JsonEncodedText.Encode(lp.Method).Value)
              .Append('"').Append(sep)
              .Append("\"stderr\"").Append(colon).Append(Number(lp.Stderr)).Append('}');
        }
        if (includeMetadata && m.MetadataJson is { } meta) { Key("metadata"); sb.Append(meta); }
        sb.Append(nl).Append('}').Append(nl);
        return sb.ToString();
    }

    /// <summary>Streaming parser over the bytes; keeps them to turn token offsets into line:column.</summary>
    private ref struct Parser
    {
        private JsonCursor _c;

        public Parser(ReadOnlySpan<byte> bytes, string source) => _c = new JsonCursor(bytes, source, "model");

        private ImmutableArray<double> NumberArray(string field)
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartArray, $"an array of numbers for {field}");
            var list = ImmutableArray.CreateBuilder<double>();
            while (true)
            {
                _c.Read();
                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                _c.Expect(JsonTokenType.Number, $"a number in {field}");
                if (!_c.R.TryGetDouble(out double d) || !double.IsFinite(d))
                    throw _c.Error($"{field}[{list.Count}] is not a finite number", "every number must be finite");
                list.Add(d);
            }
            return list.ToImmutable();
        }

        public BoltzmannModel ParseModel()
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartObject, "a JSON object");
            var seen = new HashSet<string>();
            string? format = null; int? version = null; ModelKind? kind = null;
            int? visible = null, hidden = null;
            ImmutableArray<string> names = default;
            ImmutableArray<double> vb = default, hb = default;
            List<(ImmutableArray<double> Row, long Offset)>? rows = null;
            long weightsOffset = 0;
            List<(Link Link, long Offset)>? vlinks = null, hlinks = null;
            double? threshold = null;
            LogPartition? logZ = null;
            string? metadata = null;
            long sizeOffset = 0;

            while (_c.NextField(seen, null, out string key))
            {
                long keyOffset = _c.R.TokenStartIndex;
                switch (key)
                {
                    case "format":
                        _c.Format(FormatName, "this is not an emit model file; .npz files are read by extension");
                        format = FormatName;
                        break;
                    case "version":
                        version = _c.Version(FormatVersion);
                        break;
                    case "kind":
                        {
                            string k = _c.String(key);
                            kind = ModelKindNames.Parse(k)
                                ?? throw _c.Error($"kind \"{k}\" is unknown", "use rbm, lateral or general");
                            break;
                        }
                    case "visible": visible = _c.Integer(key, 1, ModelLimits.MaxUnits); sizeOffset = keyOffset; break;
                    case "hidden": hidden = _c.Integer(key, 0, ModelLimits.MaxUnits); sizeOffset = keyOffset; break;
                    case "names":
                        {
                            _c.Read();
                            _c.Expect(JsonTokenType.StartArray, "an array of strings for names");
                            var b = ImmutableArray.CreateBuilder<string>();
                            while (true)
                            {
                                _c.Read();
                                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                                _c.Expect(JsonTokenType.String, "a string in names");
                                b.Add(_c.Text());
                            }
                            names = b.ToImmutable();
                            break;
                        }
                    case "visible_bias": vb = NumberArray(key); break;
                    case "hidden_bias": hb = NumberArray(key); break;
                    case "weights":
                        {
                            weightsOffset = keyOffset;
                            _c.Read();
                            _c.Expect(JsonTokenType.StartArray, "an array of rows for weights");
                            rows = new();
                            while (true)
                            {
                                _c.Read();
                                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                                long rowOffset = _c.R.TokenStartIndex;
                                _c.Expect(JsonTokenType.StartArray, $"an array for weights row {rows.Count}");
                                var b = ImmutableArray.CreateBuilder<double>();
                                while (true)
                                {
                                    _c.Read();
                                    if (_c.R.TokenType == JsonTokenType.EndArray) break;
                                    _c.Expect(JsonTokenType.Number, $"a number in weights row {rows.Count}");
                                    if (!_c.R.TryGetDouble(out double d) || !double.IsFinite(d))
                                        throw _c.Error($"weights[{rows.Count}][{b.Count}] is not a finite number",
                                            "every number must be finite");
                                    b.Add(d);
                                }
                                rows.Add((b.ToImmutable(), rowOffset));
                            }
                            break;
                        }
                    case "visible_links": vlinks = LinkArray(key); break;
                    case "hidden_links": hlinks = LinkArray(key); break;
                    case "threshold":
                        _c.Read();
                        if (_c.R.TokenType != JsonTokenType.Null)
                        {
                            _c.Expect(JsonTokenType.Number, "a number for threshold");
                            if (!_c.R.TryGetDouble(out double t) || !double.IsFinite(t))
                                throw _c.Error("threshold is not a finite number");
                            threshold = t;
                        }
                        break;
                    case "log_partition":
                        _c.Read();
                        if (_c.R.TokenType != JsonTokenType.Null) logZ = LogPartitionObject();
                        break;
                    case "metadata":
                        {
                            _c.Read();
                            long start = _c.R.TokenStartIndex;
                            if (_c.R.TokenType is JsonTokenType.StartObject or JsonTokenType.StartArray)
                            {
                                _c.Skip("metadata");
                            }
                            long end = _c.R.TokenStartIndex +
                                (_c.R.HasValueSequence ? _c.R.ValueSequence.Length : _c.R.ValueSpan.Length) +
                                (_c.R.TokenType == JsonTokenType.String ? 2 : 0);
                            metadata = Encoding.UTF8.GetString(_c.Bytes[(int)start..(int)end]);
                            break;
                        }
                    default:
                        throw _c.Error($"unknown field \"{key}\"",
                            "see docs/model-format.md for the fields of version 1");
                }
            }
            // Nothing but whitespace may follow the object.
            _c.ExpectEnd();

            long endOffset = _c.Bytes.Length;
            if (format is null) throw _c.Error("missing field \"format\"", $"add \"format\": \"{FormatName}\"", 0);
            if (version is null) throw _c.Error("missing field \"version\"", $"add \"version\": {FormatVersion}", 0);
            if (kind is null)
                throw _c.Error("missing field \"kind\"", "add \"kind\": \"rbm\", \"lateral\" or \"general\"", 0);
            if (visible is null) throw _c.Error("missing field \"visible\"", null, 0);
            if (hidden is null) throw _c.Error("missing field \"hidden\"", null, 0);
            if ((long)visible.Value * hidden.Value > ModelLimits.MaxWeights)
                throw _c.Error(
                    $"visible × hidden = {(long)visible.Value * hidden.Value} weights is more than the " +
                    $"{ModelLimits.MaxWeights} allowed", null, sizeOffset);
            if (vb.IsDefault) throw _c.Error("missing field \"visible_bias\"", null, 0);
            if (hb.IsDefault) throw _c.Error("missing field \"hidden_bias\"", null, 0);
            if (rows is null) throw _c.Error("missing field \"weights\"", null, 0);
            if (vb.Length != visible)
                throw _c.Error($"visible_bias has {vb.Length} values, expected visible = {visible}", null, 0);
            if (hb.Length != hidden)
                throw _c.Error($"hidden_bias has {hb.Length} values, expected hidden = {hidden}", null, 0);
            if (rows.Count != visible)
                throw _c.Error($"weights has {rows.Count} rows, expected visible = {visible}",
                    "weights[i][j] couples visible i and hidden j", weightsOffset);
            var w = new double[(long)visible.Value * hidden.Value];
            for (int i = 0; i < rows.Count; i++)
            {
                if (rows[i].Row.Length != hidden)
                    throw _c.Error($"weights row {i} has {rows[i].Row.Length} values, expected hidden = {hidden}", null,
                        rows[i].Offset);
                rows[i].Row.CopyTo(w, i * hidden.Value);
            }
            if (!names.IsDefault && names.Length != visible)
                throw _c.Error($"names has {names.Length} entries, expected visible = {visible}", null, 0);
            if (kind == ModelKind.Rbm && vlinks is { Count: > 0 })
                throw _c.Error("kind rbm has visible_links", "use kind lateral or general, or remove the links",
                    vlinks[0].Offset);
            if (kind != ModelKind.General && hlinks is { Count: > 0 })
                throw _c.Error($"kind {kind.Value.ToText()} has hidden_links", "use kind general, or remove the links",
                    hlinks[0].Offset);
            var vl = SortLinks("visible_links", vlinks, visible.Value);
            var hl = SortLinks("hidden_links", hlinks, hidden.Value);
            _ = endOffset;
            try
            {
                return new BoltzmannModel(kind.Value, visible.Value, hidden.Value, vb, hb, ImmutableArray.Create(w), vl,
                    hl,
                    names, threshold, logZ, metadata);
            }
            catch (EmitException e) { throw e.InFile(_c.Source); }
        }

        private ImmutableArray<Link> SortLinks(string field, List<(Link Link, long Offset)>? links, int units)
        {
            if (links is null) return ImmutableArray<Link>.Empty;
            foreach (var (l, off) in links)
            {
                if (l.I == l.J)
                    throw _c.Error($"{field} has a self link [{l.I}, {l.J}]", "a unit cannot be linked to itself", off);
                if (l.I < 0 || l.J < 0 || l.I >= units || l.J >= units)
                    throw _c.Error($"{field} link [{l.I}, {l.J}] is out of range",
                        $"unit indices go from 0 to {units - 1}", off);
                if (l.I > l.J)
                    throw _c.Error($"{field} link [{l.I}, {l.J}] has i > j", "write each link once with i < j", off);
            }
            var sorted = links.OrderBy(x => x.Link.I).ThenBy(x => x.Link.J).ToList();
            for (int k = 1; k < sorted.Count; k++)
                if (sorted[k].Link.I == sorted[k - 1].Link.I && sorted[k].Link.J == sorted[k - 1].Link.J)
                    throw _c.Error($"{field} has link [{sorted[k].Link.I}, {sorted[k].Link.J}] twice",
                        "merge duplicate links into one", Math.Max(sorted[k].Offset, sorted[k - 1].Offset));
            return sorted.Select(x => x.Link).ToImmutableArray();
        }

        private List<(Link, long)> LinkArray(string field)
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartArray, $"an array of [i, j, w] for {field}");
            var list = new List<(Link, long)>();
            while (true)
            {
                _c.Read();
                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                long off = _c.R.TokenStartIndex;
                _c.Expect(JsonTokenType.StartArray, $"[i, j, w] in {field}");
                int i = _c.Integer($"{field}[{list.Count}] i", int.MinValue, int.MaxValue);
                int j = _c.Integer($"{field}[{list.Count}] j", int.MinValue, int.MaxValue);
                double w = _c.Number($"{field}[{list.Count}] w");
                _c.Read();
                if (_c.R.TokenType != JsonTokenType.EndArray)
                    throw _c.Error($"{field}[{list.Count}] has more than three values", "each link is [i, j, w]");
                list.Add((new Link(i, j, w), off));
                if (list.Count > ModelLimits.MaxLinks)
                    throw _c.Error($"{field} has more than {ModelLimits.MaxLinks} links");
            }
            return list;
        }

        private LogPartition LogPartitionObject()
        {
            _c.Expect(JsonTokenType.StartObject, "an object for log_partition");
            double? value = null, stderr = null; string? method = null;
            var seen = new HashSet<string>(StringComparer.Ordinal);
            while (_c.NextField(seen, "log_partition", out string k))
            {
                switch (k)
                {
                    case "value": value = _c.Number("log_partition.value"); break;
                    case "stderr":
                        stderr = _c.Number("log_partition.stderr");
                        if (stderr < 0) throw _c.Error("log_partition.stderr is negative");
                        break;
                    case "method":
                        method = _c.String("log_partition.method");
                        if (method is not ("exact" or "ais"))
                            throw _c.Error($"log_partition.method \"{method}\" is unknown", "use \"exact\" or \"ais\"");
                        break;
                    default: throw _c.Error($"unknown field \"log_partition.{k}\"",
                        "log_partition has value, method and stderr");
                }
            }
            if (value is null) throw _c.Error("log_partition has no value");
            return new LogPartition(value.Value, method ?? "exact", stderr ?? 0.0);
        }
    }
}
