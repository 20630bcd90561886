using System.Text.Json;
using Emit.Detection;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Project;

/// <summary>
/// Reads the project file format version 1 (<c>"format": "emit.project"</c>; docs/project-file.md): a list of scorers,
/// each a model plus the options of <c>emit compile</c>, so that one command regenerates every output the same way.
/// Paths are relative to the project file's folder. Errors name the line and column of the offending token.
/// </summary>
public static class ProjectFile
{
    /// <summary>The "format" value of a project file.</summary>
    public const string FormatName = "emit.project";
    /// <summary>The project file format version this reader accepts.</summary>
    public const int FormatVersion = 1;

    /// <summary>Largest project file accepted (bytes); refused before reading.</summary>
    public const long MaxFileBytes = 1024 * 1024;

    /// <summary>Most scorers one project may list.</summary>
    public const int MaxScorers = 256;

    /// <summary>Most models one classifier entry may list (as <c>emit compile</c> accepts).</summary>
    public const int MaxModels = 64;

    /// <summary>Reads and checks a project file; errors carry <paramref name="path"/>.</summary>
    public static EmitProject Read(string path) =>
        Parse(JsonCursor.ReadFile(path, MaxFileBytes, "a project file"), path,
            Path.GetDirectoryName(Path.GetFullPath(path))!);

    /// <summary>
    /// Parses project JSON from UTF-8 bytes (a leading byte-order mark is accepted); relative paths are taken from
    /// <paramref name="baseDirectory"/>, and every model file must exist there.
    /// </summary>
    public static EmitProject Parse(ReadOnlySpan<byte> utf8, string source, string baseDirectory)
    {
        var parser = new Parser(JsonCursor.Content(utf8, source, "a JSON project object"), source, baseDirectory);
        return parser.ParseProject();
    }

    private ref struct Parser
    {
        private JsonCursor _c;
        private readonly string _base;

        public Parser(ReadOnlySpan<byte> bytes, string source, string baseDirectory)
        {
            _c = new JsonCursor(bytes, source, "project");
            _base = baseDirectory;
        }

        public EmitProject ParseProject()
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartObject, "a JSON object");
            var seen = new HashSet<string>(StringComparer.Ordinal);
            string? format = null;
            int? version = null;
            List<ProjectScorer>? scorers = null;
            while (_c.NextField(seen, null, out string key))
            {
                switch (key)
                {
                    case "format":
                        _c.Format(FormatName, "this is not an emit project file");
                        format = FormatName;
                        break;
                    case "version":
                        version = _c.Version(FormatVersion);
                        break;
                    case "scorers":
                        scorers = Scorers();
                        break;
                    default:
                        throw _c.Error($"unknown field \"{Naming.CommentText(key)}\"",
                            "a project has format, version and scorers (docs/project-file.md)");
                }
            }
            _c.ExpectEnd();
            if (format is null) throw _c.Error("missing field \"format\"", $"add \"format\": \"{FormatName}\"", 0);
            if (version is null) throw _c.Error("missing field \"version\"", $"add \"version\": {FormatVersion}", 0);
            if (scorers is null) throw _c.Error("missing field \"scorers\"", "list the scorers to generate", 0);
            return new EmitProject(_c.Source, scorers);
        }

        private List<ProjectScorer> Scorers()
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartArray, "an array of scorers");
            long start = _c.R.TokenStartIndex;
            var list = new List<ProjectScorer>();
            var outputs = new Dictionary<string,
                int>(OperatingSystem.IsWindows() ? StringComparer.OrdinalIgnoreCase : StringComparer.Ordinal);
            while (true)
            {
                _c.Read();
                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                if (list.Count == MaxScorers) throw _c.Error($"more than {MaxScorers} scorers", "split the project");
                long offset = _c.R.TokenStartIndex;
                var scorer = Scorer(list.Count, offset);
                // Two entries must not write the same file: the second would silently replace the first. An entry
                // writes each name's sources and manifest (a classifier: its own and those of NAME_1 ... NAME_n).
                var extensions = scorer.Options.Targets.SelectMany(t => Targets.Find(t)!.Extensions).Distinct();
                foreach (var name in scorer.Names)
                    foreach (var fileName in extensions.Select(ext => name + ext)
                                 .Append(SourceManifest.FileNameFor(name)))
                    {
                        var file = Path.Combine(scorer.OutDirectory, fileName);
                        if (outputs.TryGetValue(file, out int other))
                            throw _c.Error(
                                $"scorers[{list.Count}] writes {Naming.CommentText(fileName)} in the " +
                                $"same folder as scorers[{other}]",
                                "give one of them another name or out folder", offset);
                        outputs[file] = list.Count;
                    }
                list.Add(scorer);
            }
            if (list.Count == 0) throw _c.Error("scorers is empty", "list at least one scorer", start);
            return list;
        }

        private ProjectScorer Scorer(int index, long offset)
        {
            _c.Expect(JsonTokenType.StartObject, $"an object for scorers[{index}]");
            string at = $"scorers[{index}]";
            var seen = new HashSet<string>(StringComparer.Ordinal);
            string? model = null, name = null, ns = null, outDir = null, templates = null;
            long nameOffset = 0;
            List<string>? targets = null;
            NumericMode numeric = NumericMode.F32;
            int selfTest = CompileOptions.DefaultSelfTestVectors;
            OptimizeFor optimize = OptimizeFor.Speed;
            WeightType weights = WeightType.Int16;
            AccumulatorType? accumulator = null;
            int table = FixedPointOptions.DefaultTableSize;
            (string Key, long Offset)? fixedOnly = null; // the first fixed-point field, refused unless numeric is fixed
            long nsOffset = 0;
            // a classifier: its models, their offset, its priors (and where they start)
            List<string>? models = null;
            List<double>? priors = null;
            long modelsOffset = 0, priorsKey = 0, priorsOffset = 0;
            // firmware features, for one model only; the first one given, refused for a classifier
            AlarmFilterSpec? filter = null;
            bool stream = false, explain = false;
            (string Key, long Offset)? singleOnly = null;
            while (_c.NextField(seen, at, out string key))
            {
                long keyOffset = _c.R.TokenStartIndex;
                string field = at + "." + key;
                switch (key)
                {
                    case "model":
                        model = PathValue(field);
                        if (!File.Exists(model))
                            throw _c.Error($"{field}: file not found: {Naming.CommentText(model)}",
                                "check the path; paths are relative to the project file's folder");
                        break;
                    case "name":
                        name = _c.String(field);
                        nameOffset = _c.R.TokenStartIndex;
                        break;
                    case "targets":
                        targets = StringArray(field);
                        break;
                    case "numeric":
                        {
                            var text = _c.String(field);
                            numeric = NumericModeNames.Parse(text)
                                ?? throw _c.Error($"{field} \"{Naming.CommentText(text)}\" is unknown",
                                    "use f32, f64 or fixed");
                            break;
                        }
                    case "namespace":
                        ns = _c.String(field);
                        nsOffset = _c.R.TokenStartIndex;
                        break;
                    case "out": outDir = PathValue(field); break;
                    case "templates":
                        templates = PathValue(field);
                        if (!Directory.Exists(templates))
                            throw _c.Error($"{field}: folder not found: {Naming.CommentText(templates)}",
                                "paths are relative to the project file's folder");
                        break;
                    case "selftest_vectors": selfTest = _c.Integer(field, 1, CompileOptions.MaxSelfTestVectors); break;
                    case "optimize":
                        {
                            var text = _c.String(field);
                            optimize = OptimizeForNames.Parse(text)
                                ?? throw _c.Error($"{field} \"{Naming.CommentText(text)}\" is unknown",
                                    "use speed or size");
                            break;
                        }
                    case "weights":
                        {
                            var text = _c.String(field);
                            weights = WeightTypeInfo.Parse(text)
                                ?? throw _c.Error($"{field} \"{Naming.CommentText(text)}\" is unknown",
                                    "use int8, int16 or int32");
                            fixedOnly ??= (key, keyOffset);
                            break;
                        }
                    case "accumulator":
                        {
                            var text = _c.String(field);
                            accumulator = text == "auto" ? null
                                : AccumulatorTypeInfo.Parse(text)
                                ?? throw _c.Error($"{field} \"{Naming.CommentText(text)}\" is unknown",
                                    "use auto, int32 or int64");
                            fixedOnly ??= (key, keyOffset);
                            break;
                        }
                    case "softplus_table":
                        table = _c.Integer(field, FixedPointOptions.MinTableSize, FixedPointOptions.MaxTableSize);
                        if (!System.Numerics.BitOperations.IsPow2(table))
                            throw _c.Error($"{field} = {table} is not a power of two",
                                $"use a power of two from {FixedPointOptions.MinTableSize} to " +
                                $"{FixedPointOptions.MaxTableSize}");
                        fixedOnly ??= (key, keyOffset);
                        break;
                    case "models":
                        models = ModelList(field, out modelsOffset);
                        break;
                    case "priors":
                        priorsKey = keyOffset;
                        priors = NumberArray(field, out priorsOffset);
                        break;
                    case "alarm_filter":
                        {
                            var text = _c.String(field);
                            try { filter = AlarmFilterSpec.Parse(text); }
                            catch (EmitException e) { throw _c.Error($"{field}: {e.Problem}", e.Hint); }
                            singleOnly ??= (key, keyOffset);
                            break;
                        }
                    case "stream":
                        stream = _c.Boolean(field);
                        if (stream) singleOnly ??= (key, keyOffset);
                        break;
                    case "explain":
                        explain = _c.Boolean(field);
                        if (explain) singleOnly ??= (key, keyOffset);
                        break;
                    default:
                        throw _c.Error($"unknown field \"{Naming.CommentText(key)}\" in {at}",
                            "a scorer has model (or models, priors for a classifier), name, targets, numeric, " +
                            "namespace, out, templates, selftest_vectors, optimize, alarm_filter, stream, explain, " +
                            "and for numeric fixed weights, accumulator, softplus_table");
                }
            }
            if (model is not null && models is not null)
                throw _c.Error($"{at} has both model and models",
                    "give model for one scorer, or models for a classifier over several", offset);
            if (models is not null)
            {
                if (models.Count < 2)
                    throw _c.Error($"{at}.models lists {models.Count} model{(models.Count == 1 ? "" : "s")}",
                        "a classifier needs two or more; give model for one scorer", modelsOffset);
                if (name is null)
                    throw _c.Error($"{at} is a classifier and needs a name",
                        "add \"name\": \"NAME\" (files NAME.h, NAME.c, NAME.cs and NAME_1 ... per model)", offset);
                if (singleOnly is { } single)
                    throw _c.Error($"{at}.{single.Key} is for one model, not a classifier",
                        "compile each model on its own with it", single.Offset);
                if (priors is not null && priors.Count != models.Count)
                    throw _c.Error($"{at}.priors: {priors.Count} priors for {models.Count} models",
                        "give one prior per model, in the same order", priorsOffset);
                if (priors is not null && priors.Any(p => !(p > 0)))
                    throw _c.Error($"{at}.priors: every prior must be a positive finite number",
                        "priors are relative weights, e.g. [0.9, 0.1]", priorsOffset);
                model = models[0];
            }
            else if (priors is not null)
                throw _c.Error($"{at}.priors applies to a classifier (models)",
                    "list two or more models in models, or leave priors out", priorsKey);
            if (model is null)
                throw _c.Error($"{at} has no model",
                    "add \"model\": \"path/to/model.json\" (or \"models\": [...] for a classifier)", offset);
            if (fixedOnly is { } f && numeric != NumericMode.Fixed)
                throw _c.Error($"{at}.{f.Key} applies to numeric fixed only",
                    "add \"numeric\": \"fixed\" or leave the field out", f.Offset);
            name ??= Naming.ScorerNameFromFile(model);
            try { Naming.CheckScorerName(name); }
            catch (EmitException e) { throw _c.Error($"{at}: {e.Problem}", e.Hint,
                nameOffset == 0 ? offset : nameOffset); }
            try { Naming.CheckNamespace(ns ?? CompileOptions.DefaultNamespace); }
            catch (EmitException e) { throw _c.Error($"{at}: {e.Problem}", e.Hint, nsOffset); }
            targets ??= ["c"];
            if (targets.Count == 0)
                throw _c.Error($"{at}.targets is empty", $"use one or more of: {Targets.NameList}", offset);
            foreach (var t in targets)
                if (Targets.Find(t) is null)
                    throw _c.Error($"{at}.targets: unknown target \"{Naming.CommentText(t)}\"",
                        $"use one or more of: {Targets.NameList}", offset);
            var fixedOptions = numeric == NumericMode.Fixed ? new FixedPointOptions(weights, accumulator, table) : null;
            var options = new CompileOptions(targets.Distinct().ToArray(), numeric, name,
                ns ?? CompileOptions.DefaultNamespace, selfTest, templates, fixedOptions, optimize, stream, explain,
                filter);
            return new ProjectScorer(model, outDir ?? Path.Combine(_base, "out"), options, _c.Position(offset).Line)
            {
                ModelPaths = models ?? [model],
                Priors = priors,
            };
        }

        /// <summary>
        /// A path value, made absolute against the project folder; control characters and NUL are refused.
        /// </summary>
        private string PathValue(string field) => PathText(field, _c.String(field));

        /// <summary>
        /// <paramref name="text"/> as a path made absolute against the project folder; control characters and NUL are
        /// refused.
        /// </summary>
        private readonly string PathText(string field, string text)
        {
            if (text.Length == 0) throw _c.Error($"{field} is empty", "give a path");
            if (text.Any(char.IsControl) || text.IndexOfAny(Path.GetInvalidPathChars()) >= 0)
                throw _c.Error($"{field} holds characters a path cannot have");
            try { return Path.GetFullPath(text, _base); }
            catch (Exception e) when (e is ArgumentException or NotSupportedException or PathTooLongException)
            {
                throw _c.Error($"{field} is not a usable path: {e.Message}");
            }
        }

        /// <summary>
        /// A classifier's model files: an array of paths, each of an existing file; <paramref name="start"/> is where
        /// it starts, for messages.
        /// </summary>
        private List<string> ModelList(string field, out long start)
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartArray, $"an array of model files for {field}");
            start = _c.R.TokenStartIndex;
            var list = new List<string>();
            while (true)
            {
                _c.Read();
                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                if (list.Count == MaxModels) throw _c.Error($"{field} lists more than {MaxModels} models");
                var item = $"{field}[{list.Count}]";
                _c.Expect(JsonTokenType.String, $"a string for {item}");
                var path = PathText(item, _c.Text());
                if (!File.Exists(path))
                    throw _c.Error($"{item}: file not found: {Naming.CommentText(path)}",
                        "check the path; paths are relative to the project file's folder");
                list.Add(path);
            }
            return list;
        }

        /// <summary>An array of finite numbers; <paramref name="start"/> is where it starts, for messages.</summary>
        private List<double> NumberArray(string field, out long start)
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartArray, $"an array of numbers for {field}");
            start = _c.R.TokenStartIndex;
            var list = new List<double>();
            while (true)
            {
                _c.Read();
                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                if (list.Count == MaxModels) throw _c.Error($"{field} lists more than {MaxModels} numbers");
                _c.Expect(JsonTokenType.Number, $"a number in {field}");
                if (!_c.R.TryGetDouble(out double d) || !double.IsFinite(d))
                    throw _c.Error($"{field} holds a number that is not finite", "every number must be finite");
                list.Add(d);
            }
            return list;
        }

        private List<string> StringArray(string field)
        {
            _c.Read();
            _c.Expect(JsonTokenType.StartArray, $"an array of strings for {field}");
            var list = new List<string>();
            while (true)
            {
                _c.Read();
                if (_c.R.TokenType == JsonTokenType.EndArray) break;
                _c.Expect(JsonTokenType.String, $"a string in {field}");
                if (list.Count == 16) throw _c.Error($"{field} lists more than 16 entries");
                list.Add(_c.Text());
            }
            return list;
        }
    }
}
