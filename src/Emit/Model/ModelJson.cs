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
    public const string FormatName = "emit.model";
    public const int FormatVersion = 1;

    /// <summary>Largest model file accepted (bytes).</summary>
    public const long MaxFileBytes = 2L * 1024 * 1024 * 1024 - 1;

    /// <summary>Reads a model JSON file; errors carry <paramref name="path"/>.</summary>
    public static BoltzmannModel Read(string path)
    {
        byte[] bytes;
        try
        {
            var info = new FileInfo(path);
            if (!info.Exists) throw new EmitException("file not found", "check the path", path);
            if (info.Length > MaxFileBytes) throw new EmitException($"file is {info.Length} bytes, more than a model file may be", null, path);
            bytes = File.ReadAllBytes(path);
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        return Parse(bytes, path);
    }

    /// <summary>Parses model JSON from UTF-8 bytes (a leading byte-order mark is accepted).</summary>
    public static BoltzmannModel Parse(ReadOnlySpan<byte> utf8, string source)
    {
        if (utf8.StartsWith("\uFEFF"u8)) utf8 = utf8[3..];
        if (utf8.IsEmpty || utf8.Trim(" \t\r\n"u8).IsEmpty)
            throw new EmitException("file is empty", "expected a JSON model object", source);
        var parser = new Parser(utf8, source);
        return parser.ParseModel();
    }

    /// <summary>Writes the model as readable JSON (one weight row per line), metadata included.</summary>
    public static string ToText(BoltzmannModel model) => Write(model, pretty: true, includeMetadata: true);

    /// <summary>The canonical serialisation: compact, fixed key order, shortest round-trip numbers, no metadata.</summary>
    public static string Canonical(BoltzmannModel model) => Write(model, pretty: false, includeMetadata: false);

    internal static string CanonicalSha256(BoltzmannModel model) =>
        Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(Canonical(model))));

    /// <summary>Writes the model to <paramref name="path"/> atomically (temporary file, then rename).</summary>
    public static void WriteFile(BoltzmannModel model, string path) => AtomicFile.WriteAllText(path, ToText(model));

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
              .Append("\"method\"").Append(colon).Append('"').Append(JsonEncodedText.Encode(lp.Method).Value).Append('"').Append(sep)
              .Append("\"stderr\"").Append(colon).Append(Number(lp.Stderr)).Append('}');
        }
        if (includeMetadata && m.MetadataJson is { } meta) { Key("metadata"); sb.Append(meta); }
        sb.Append(nl).Append('}').Append(nl);
        return sb.ToString();
    }

    /// <summary>Streaming parser over the bytes; keeps them to turn token offsets into line:column.</summary>
    private ref struct Parser
    {
        private readonly ReadOnlySpan<byte> _bytes;
        private readonly string _source;
        private Utf8JsonReader _r;

        public Parser(ReadOnlySpan<byte> bytes, string source)
        {
            _bytes = bytes;
            _source = source;
            _r = new Utf8JsonReader(bytes, new JsonReaderOptions { CommentHandling = JsonCommentHandling.Skip, MaxDepth = 64 });
        }

        private EmitException Error(string problem, string? hint = null) => Error(problem, hint, _r.TokenStartIndex);

        private EmitException Error(string problem, string? hint, long offset)
        {
            long line = 1, lastNl = -1;
            long end = Math.Min(offset, _bytes.Length);
            for (int k = 0; k < end; k++)
                if (_bytes[k] == (byte)'\n') { line++; lastNl = k; }
            return new EmitException(problem, hint, _source, line, offset - lastNl);
        }

        private void Read()
        {
            try
            {
                if (!_r.Read()) throw Error("file ends before the model is complete", "the file may be truncated", _bytes.Length);
            }
            catch (JsonException e)
            {
                throw new EmitException($"not valid JSON: {FirstSentence(e.Message)}", "the file may be truncated or not a model file",
                    _source, (e.LineNumber ?? 0) + 1, (e.BytePositionInLine ?? 0) + 1);
            }
        }

        private static string FirstSentence(string message)
        {
            int k = message.IndexOf(" LineNumber", StringComparison.Ordinal);
            return (k > 0 ? message[..k] : message).TrimEnd('.', ' ');
        }

        private void Expect(JsonTokenType type, string what)
        {
            if (_r.TokenType != type) throw Error($"expected {what}, found {Describe(_r.TokenType)}");
        }

        private static string Describe(JsonTokenType t) => t switch
        {
            JsonTokenType.StartObject => "an object",
            JsonTokenType.StartArray => "an array",
            JsonTokenType.String => "a string",
            JsonTokenType.Number => "a number",
            JsonTokenType.True or JsonTokenType.False => "true/false",
            JsonTokenType.Null => "null",
            JsonTokenType.EndArray => "the end of an array",
            JsonTokenType.EndObject => "the end of an object",
            _ => t.ToString(),
        };

        private double Number(string field)
        {
            Read();
            Expect(JsonTokenType.Number, $"a number for {field}");
            if (!_r.TryGetDouble(out double d) || !double.IsFinite(d))
                throw Error($"{field} is not a finite number", "every number must be finite");
            return d;
        }

        private int Integer(string field, int min, int max)
        {
            Read();
            Expect(JsonTokenType.Number, $"an integer for {field}");
            if (!_r.TryGetInt64(out long v))
                throw Error($"{field} must be a whole number");
            if (v < min || v > max)
                throw Error($"{field} = {v} is out of range", $"use {min} to {max}");
            return (int)v;
        }

        /// <summary>The current string token; invalid UTF-8 inside it is the tool's error, not the JSON reader's.</summary>
        private string Text()
        {
            try { return _r.GetString()!; }
            catch (InvalidOperationException) { throw Error("text is not valid UTF-8", "save the file as UTF-8"); }
        }

        private string String(string field)
        {
            Read();
            Expect(JsonTokenType.String, $"a string for {field}");
            return Text();
        }

        private ImmutableArray<double> NumberArray(string field)
        {
            Read();
            Expect(JsonTokenType.StartArray, $"an array of numbers for {field}");
            var list = ImmutableArray.CreateBuilder<double>();
            while (true)
            {
                Read();
                if (_r.TokenType == JsonTokenType.EndArray) break;
                Expect(JsonTokenType.Number, $"a number in {field}");
                if (!_r.TryGetDouble(out double d) || !double.IsFinite(d))
                    throw Error($"{field}[{list.Count}] is not a finite number", "every number must be finite");
                list.Add(d);
            }
            return list.ToImmutable();
        }

        public BoltzmannModel ParseModel()
        {
            Read();
            Expect(JsonTokenType.StartObject, "a JSON object");
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

            while (true)
            {
                Read();
                if (_r.TokenType == JsonTokenType.EndObject) break;
                Expect(JsonTokenType.PropertyName, "a field name");
                string key = Text();
                long keyOffset = _r.TokenStartIndex;
                if (!seen.Add(key)) throw Error($"field \"{key}\" appears twice");
                switch (key)
                {
                    case "format":
                        format = String(key);
                        if (format != FormatName) throw Error($"format \"{format}\" is not \"{FormatName}\"", "this is not an emit model file; .npz files are read by extension");
                        break;
                    case "version":
                        Read();
                        Expect(JsonTokenType.Number, "a version number");
                        if (!_r.TryGetInt32(out int ver) || ver != FormatVersion)
                            throw Error($"version {Encoding.UTF8.GetString(_r.ValueSpan)} is not supported", $"this emit reads version {FormatVersion}");
                        version = ver;
                        break;
                    case "kind":
                        {
                            string k = String(key);
                            kind = ModelKindNames.Parse(k) ?? throw Error($"kind \"{k}\" is unknown", "use rbm, lateral or general");
                            break;
                        }
                    case "visible": visible = Integer(key, 1, ModelLimits.MaxUnits); sizeOffset = keyOffset; break;
                    case "hidden": hidden = Integer(key, 0, ModelLimits.MaxUnits); sizeOffset = keyOffset; break;
                    case "names":
                        {
                            Read();
                            Expect(JsonTokenType.StartArray, "an array of strings for names");
                            var b = ImmutableArray.CreateBuilder<string>();
                            while (true)
                            {
                                Read();
                                if (_r.TokenType == JsonTokenType.EndArray) break;
                                Expect(JsonTokenType.String, "a string in names");
                                b.Add(Text());
                            }
                            names = b.ToImmutable();
                            break;
                        }
                    case "visible_bias": vb = NumberArray(key); break;
                    case "hidden_bias": hb = NumberArray(key); break;
                    case "weights":
                        {
                            weightsOffset = keyOffset;
                            Read();
                            Expect(JsonTokenType.StartArray, "an array of rows for weights");
                            rows = new();
                            while (true)
                            {
                                Read();
                                if (_r.TokenType == JsonTokenType.EndArray) break;
                                long rowOffset = _r.TokenStartIndex;
                                Expect(JsonTokenType.StartArray, $"an array for weights row {rows.Count}");
                                var b = ImmutableArray.CreateBuilder<double>();
                                while (true)
                                {
                                    Read();
                                    if (_r.TokenType == JsonTokenType.EndArray) break;
                                    Expect(JsonTokenType.Number, $"a number in weights row {rows.Count}");
                                    if (!_r.TryGetDouble(out double d) || !double.IsFinite(d))
                                        throw Error($"weights[{rows.Count}][{b.Count}] is not a finite number", "every number must be finite");
                                    b.Add(d);
                                }
                                rows.Add((b.ToImmutable(), rowOffset));
                            }
                            break;
                        }
                    case "visible_links": vlinks = LinkArray(key); break;
                    case "hidden_links": hlinks = LinkArray(key); break;
                    case "threshold":
                        Read();
                        if (_r.TokenType != JsonTokenType.Null)
                        {
                            Expect(JsonTokenType.Number, "a number for threshold");
                            if (!_r.TryGetDouble(out double t) || !double.IsFinite(t)) throw Error("threshold is not a finite number");
                            threshold = t;
                        }
                        break;
                    case "log_partition":
                        Read();
                        if (_r.TokenType != JsonTokenType.Null) logZ = LogPartitionObject();
                        break;
                    case "metadata":
                        {
                            Read();
                            long start = _r.TokenStartIndex;
                            if (_r.TokenType is JsonTokenType.StartObject or JsonTokenType.StartArray)
                            {
                                try { _r.Skip(); }
                                catch (JsonException e) { throw new EmitException($"not valid JSON: {FirstSentence(e.Message)}", null, _source, (e.LineNumber ?? 0) + 1, (e.BytePositionInLine ?? 0) + 1); }
                            }
                            long end = _r.TokenStartIndex + (_r.HasValueSequence ? _r.ValueSequence.Length : _r.ValueSpan.Length) + (_r.TokenType == JsonTokenType.String ? 2 : 0);
                            metadata = Encoding.UTF8.GetString(_bytes[(int)start..(int)end]);
                            break;
                        }
                    default:
                        throw Error($"unknown field \"{key}\"", "see docs/model-format.md for the fields of version 1");
                }
            }
            // Nothing but whitespace may follow the object.
            try
            {
                if (_r.Read()) throw Error("text after the end of the model object");
            }
            catch (JsonException e)
            {
                throw new EmitException($"not valid JSON: {FirstSentence(e.Message)}", null, _source, (e.LineNumber ?? 0) + 1, (e.BytePositionInLine ?? 0) + 1);
            }

            long endOffset = _bytes.Length;
            if (format is null) throw Error("missing field \"format\"", $"add \"format\": \"{FormatName}\"", 0);
            if (version is null) throw Error("missing field \"version\"", $"add \"version\": {FormatVersion}", 0);
            if (kind is null) throw Error("missing field \"kind\"", "add \"kind\": \"rbm\", \"lateral\" or \"general\"", 0);
            if (visible is null) throw Error("missing field \"visible\"", null, 0);
            if (hidden is null) throw Error("missing field \"hidden\"", null, 0);
            if ((long)visible.Value * hidden.Value > ModelLimits.MaxWeights)
                throw Error($"visible × hidden = {(long)visible.Value * hidden.Value} weights is more than the {ModelLimits.MaxWeights} allowed", null, sizeOffset);
            if (vb.IsDefault) throw Error("missing field \"visible_bias\"", null, 0);
            if (hb.IsDefault) throw Error("missing field \"hidden_bias\"", null, 0);
            if (rows is null) throw Error("missing field \"weights\"", null, 0);
            if (vb.Length != visible) throw Error($"visible_bias has {vb.Length} values, expected visible = {visible}", null, 0);
            if (hb.Length != hidden) throw Error($"hidden_bias has {hb.Length} values, expected hidden = {hidden}", null, 0);
            if (rows.Count != visible) throw Error($"weights has {rows.Count} rows, expected visible = {visible}", "weights[i][j] couples visible i and hidden j", weightsOffset);
            var w = new double[(long)visible.Value * hidden.Value];
            for (int i = 0; i < rows.Count; i++)
            {
                if (rows[i].Row.Length != hidden)
                    throw Error($"weights row {i} has {rows[i].Row.Length} values, expected hidden = {hidden}", null, rows[i].Offset);
                rows[i].Row.CopyTo(w, i * hidden.Value);
            }
            if (!names.IsDefault && names.Length != visible)
                throw Error($"names has {names.Length} entries, expected visible = {visible}", null, 0);
            if (kind == ModelKind.Rbm && vlinks is { Count: > 0 })
                throw Error("kind rbm has visible_links", "use kind lateral or general, or remove the links", vlinks[0].Offset);
            if (kind != ModelKind.General && hlinks is { Count: > 0 })
                throw Error($"kind {kind.Value.ToText()} has hidden_links", "use kind general, or remove the links", hlinks[0].Offset);
            var vl = SortLinks("visible_links", vlinks, visible.Value);
            var hl = SortLinks("hidden_links", hlinks, hidden.Value);
            _ = endOffset;
            try
            {
                return new BoltzmannModel(kind.Value, visible.Value, hidden.Value, vb, hb, ImmutableArray.Create(w), vl, hl,
                    names, threshold, logZ, metadata);
            }
            catch (EmitException e) { throw e.InFile(_source); }
        }

        private ImmutableArray<Link> SortLinks(string field, List<(Link Link, long Offset)>? links, int units)
        {
            if (links is null) return ImmutableArray<Link>.Empty;
            foreach (var (l, off) in links)
            {
                if (l.I == l.J) throw Error($"{field} has a self link [{l.I}, {l.J}]", "a unit cannot be linked to itself", off);
                if (l.I < 0 || l.J < 0 || l.I >= units || l.J >= units)
                    throw Error($"{field} link [{l.I}, {l.J}] is out of range", $"unit indices go from 0 to {units - 1}", off);
                if (l.I > l.J) throw Error($"{field} link [{l.I}, {l.J}] has i > j", "write each link once with i < j", off);
            }
            var sorted = links.OrderBy(x => x.Link.I).ThenBy(x => x.Link.J).ToList();
            for (int k = 1; k < sorted.Count; k++)
                if (sorted[k].Link.I == sorted[k - 1].Link.I && sorted[k].Link.J == sorted[k - 1].Link.J)
                    throw Error($"{field} has link [{sorted[k].Link.I}, {sorted[k].Link.J}] twice", "merge duplicate links into one", Math.Max(sorted[k].Offset, sorted[k - 1].Offset));
            return sorted.Select(x => x.Link).ToImmutableArray();
        }

        private List<(Link, long)> LinkArray(string field)
        {
            Read();
            Expect(JsonTokenType.StartArray, $"an array of [i, j, w] for {field}");
            var list = new List<(Link, long)>();
            while (true)
            {
                Read();
                if (_r.TokenType == JsonTokenType.EndArray) break;
                long off = _r.TokenStartIndex;
                Expect(JsonTokenType.StartArray, $"[i, j, w] in {field}");
                int i = Integer($"{field}[{list.Count}] i", int.MinValue, int.MaxValue);
                int j = Integer($"{field}[{list.Count}] j", int.MinValue, int.MaxValue);
                double w = Number($"{field}[{list.Count}] w");
                Read();
                if (_r.TokenType != JsonTokenType.EndArray) throw Error($"{field}[{list.Count}] has more than three values", "each link is [i, j, w]");
                list.Add((new Link(i, j, w), off));
                if (list.Count > ModelLimits.MaxLinks) throw Error($"{field} has more than {ModelLimits.MaxLinks} links");
            }
            return list;
        }

        private LogPartition LogPartitionObject()
        {
            Expect(JsonTokenType.StartObject, "an object for log_partition");
            double? value = null, stderr = null; string? method = null;
            while (true)
            {
                Read();
                if (_r.TokenType == JsonTokenType.EndObject) break;
                string k = Text();
                switch (k)
                {
                    case "value": value = Number("log_partition.value"); break;
                    case "stderr":
                        stderr = Number("log_partition.stderr");
                        if (stderr < 0) throw Error("log_partition.stderr is negative");
                        break;
                    case "method":
                        method = String("log_partition.method");
                        if (method is not ("exact" or "ais")) throw Error($"log_partition.method \"{method}\" is unknown", "use \"exact\" or \"ais\"");
                        break;
                    default: throw Error($"unknown field \"log_partition.{k}\"", "log_partition has value, method and stderr");
                }
            }
            if (value is null) throw Error("log_partition has no value");
            return new LogPartition(value.Value, method ?? "exact", stderr ?? 0.0);
        }
    }
}
