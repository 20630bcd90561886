using System.Diagnostics;
using Emit.Emission;
using Emit.Quantize;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Harness;

/// <summary>
/// Runs generated scorers on their targets over a vector file and compares every result with the double-precision
/// reference scorer (and, in fixed mode, with the bit-exact integer simulator). The file is read once, in batches:
/// each batch is scored by the reference and sent to every target, so memory stays constant and standard input works.
/// </summary>
public static class Verifier
{
    /// <summary>
    /// Verifies; throws <see cref="EmitException"/> for bad input or a missing tool (before anything is built).
    /// Failures of the generated code (does not compile, crashes, wrong numbers) are verdicts in the report, not
    /// exceptions.
    /// </summary>
    public static VerifyReport Run(VerifyRequest request)
    {
        var model = request.Model;
        if (request.Targets.Count == 0)
            throw new EmitException("no target given",
                $"use {Setting.Targets.Ref()} with one or more of: {Runners.NameList}");
        var runners = new List<ITargetRunner>();
        foreach (var name in request.Targets)
        {
            var runner = Runners.Find(name)
                ?? throw new EmitException($"unknown target \"{Naming.CommentText(name)}\"",
                    $"use one or more of: {Runners.NameList}");
            if (!runners.Contains(runner)) runners.Add(runner);
        }
        foreach (var runner in runners) runner.CheckTools(request.Settings);
        if (request.BatchRows < 1)
            throw new ArgumentOutOfRangeException(nameof(request), "BatchRows must be at least 1");

        var languages = runners.Select(r => r.Language).Distinct().ToArray();
        var defaultName = request.Name ?? Naming.ScorerNameFromFile(request.ModelLabel);
        var warnings = new List<string>();
        var located = new Dictionary<string, ScorerSources>();
        var checks = new Dictionary<string, SourceCheckResult>();
        CompiledClassifier? classifier = null;
        NumericMode mode;
        FixedPointOptions? fixedOptions;
        Emit.Detection.AlarmFilterSpec? filter = null;
        if (request.MoreModels.Count > 0 && request.GeneratedDirectory is { } classifierDir)
        {
            classifier = ExistingClassifier.Check(request, classifierDir, languages, located, checks);
            mode = classifier.Plan.Options.Numeric;
            fixedOptions = classifier.Scorers[0].Manifest.Fixed;
        }
        else
        {
            if (request.GeneratedDirectory is { } dir)
                foreach (var language in languages)
                    located[language] = ScorerSources.Locate(dir, language, request.Name, defaultName);
            mode = ResolveMode(request, located.Values);
            fixedOptions = mode == NumericMode.Fixed ? ResolveFixed(request, located.Values) : null;
            if (request.Fixed is not null && mode != NumericMode.Fixed)
                throw new EmitException(
                    $"{Setting.Weights.Ref()}, {Setting.Accumulator.Ref()} and {Setting.SoftplusTable.Ref()} apply " +
                    $"to {Setting.Numeric.Ref()} fixed, not {mode.ToText()}",
                    $"leave them out, or use {Setting.Numeric.Ref()} fixed");
            filter = ResolveFilter(request, located.Values);
        }
        if (request.MoreModels.Count > 0 && request.GeneratedDirectory is null)
        {
            classifier = ClassifierCompiler.Build([model, .. request.MoreModels.Select(m => m.Model)],
                [request.ModelLabel, .. request.MoreModels.Select(m => m.Label)], request.Priors,
                new CompileOptions(languages, mode, defaultName, Fixed: fixedOptions, AlarmFilter: filter));
            fixedOptions = classifier.Scorers[0].Manifest.Fixed;
        }
        var expectation = NumericExpectation.For(model, mode, fixedOptions);
        var layout = expectation.Layout(model);

        // The strict check of existing sources, before anything is built (a missing templates folder is exit 2);
        // a classifier's folder was checked as a whole above.
        foreach (var (language, sources) in located)
        {
            if (checks.ContainsKey(language)) continue;
            var check = SourceCheck.Run(sources, model, request.ModelLabel, request.AllowModelChange,
                request.TemplatesDirectory);
            checks[language] = check;
            foreach (var w in check.Warnings)
                if (!warnings.Contains(w)) warnings.Add(w);
        }

        using var reader = VectorReader.Open(request.InputPath, model.Visible, request.Stdin);
        VectorNames.Check(model, reader);

        bool temporary = request.WorkDirectory is null;
        var work = request.WorkDirectory
            ?? Path.Combine(Path.GetTempPath(), "emit-verify-" + Guid.NewGuid().ToString("N")[..12]);
        Directory.CreateDirectory(work);
        try
        {
            if (request.GeneratedDirectory is null)
            {
                var src = Path.Combine(work, "src");
                Directory.CreateDirectory(src);
                var options = new CompileOptions(languages, mode, defaultName, Fixed: fixedOptions,
                    Stream: request.Stream, Explain: request.Explain, AlarmFilter: filter);
                var files = classifier?.AllFiles ?? ScorerCompiler.Build(model, request.ModelLabel, options).AllFiles;
                foreach (var f in files)
                    File.WriteAllText(Path.Combine(src, f.FileName), f.Text);
                foreach (var language in languages)
                {
                    if (classifier is null)
                    {
                        located[language] = ScorerSources.Locate(src, language, defaultName, defaultName);
                        continue;
                    }
                    located[language] = ExistingClassifier.Attach(src, language, classifier);
                }
            }
            return Compare(request, runners, located, checks, expectation, layout, reader, work, warnings,
                classifier?.Plan);
        }
        finally
        {
            if (temporary)
                try { Directory.Delete(work,
                    recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
        }
    }

    private static VerifyReport Compare(VerifyRequest request, List<ITargetRunner> runners, Dictionary<string,
        ScorerSources> located,
        Dictionary<string, SourceCheckResult> checks, NumericExpectation expectation, HarnessLayout layout,
        VectorReader reader, string work, List<string> warnings, ClassifierPlan? classifier)
    {
        var model = request.Model;
        var states = new List<State>();
        foreach (var runner in runners)
        {
            var state = new State(runner, located[runner.Language],
                new TargetComparison(expectation, request.FailOnDecisionMismatch),
                checks.GetValueOrDefault(runner.Language));
            if (located[runner.Language].Manifest.AlarmFilter is { } spec) state.Filter = new FilterCheck(spec);
            if (classifier is not null) state.Classify = new ClassifyCheck(classifier, expectation);
            if (state.Check is { } check)
            {
                state.Failures.AddRange(check.Failures);
                if (!check.Compare)
                {
                    states.Add(state);
                    continue;
                }
            }
            if (state.Sources.Manifest.HasStream) state.Stream = new StreamCheck(model, expectation);
            if (state.Sources.Manifest.Explain) state.Explain = new ExplainCheck(model, expectation);
            var watch = Stopwatch.StartNew();
            state.Session = runner.Start(state.Sources, layout, request.Settings, Path.Combine(work, runner.Name),
                out var failure);
            state.BuildSeconds = watch.Elapsed.TotalSeconds;
            if (state.Session is null) state.Failures.Add(failure);
            else state.SelfTest = state.Session.SelfTestFailures;
            states.Add(state);
        }

        var scorer = new ReferenceScorer(model);
        int v = model.Visible, pb = layout.PackedBytes, batch = Emit.Vectors.VectorBatch.Rows(v, request.BatchRows);
        var units = new byte[batch * v];
        var packed = new byte[batch * pb];
        var reference = new double[batch];
        var expectedRaw = new long[batch];
        var results = new ScoredRow[batch];
        long index = 0;
        int rows;
        try
        {
            while ((rows = reader.ReadBatch(units, batch)) > 0)
            {
                scorer.FreeEnergies(units, rows, reference);
                Array.Clear(packed);
                for (int r = 0; r < rows; r++)
                {
                    var row = units.AsSpan(r * v, v);
                    for (int i = 0; i < v; i++)
                        if (row[i] != 0) packed[r * pb + (i >> 3)] |= (byte)(1 << (i & 7));
                    if (expectation.Simulator is { } sim) expectedRaw[r] = sim.FreeEnergy(row);
                }
                foreach (var s in states)
                {
                    if (s.Session is null) continue;
                    var watch = Stopwatch.StartNew();
                    bool ok = s.Session.TryScore(packed.AsSpan(0, rows * pb), rows, results, out var failure);
                    s.ScoreSeconds += watch.Elapsed.TotalSeconds;
                    s.SelfTest = s.Session.SelfTestFailures;
                    if (!ok)
                    {
                        s.Failures.Add(failure);
                        s.Session.Dispose();
                        s.Session = null;
                        continue;
                    }
                    for (int r = 0; r < rows; r++)
                    {
                        s.Comparison.Add(index + r, reference[r], expectation.IsFixed ? expectedRaw[r] : null,
                            results[r]);
                        s.Stream?.Add(index + r, units.AsSpan(r * v, v), packed.AsSpan(r * pb, pb), results[r]);
                        s.Explain?.Add(index + r, units.AsSpan(r * v, v), results[r]);
                        s.Filter?.Add(index + r, reference[r] > model.Threshold, results[r]);
                        s.Classify?.Add(index + r, units.AsSpan(r * v, v), results[r]);
                    }
                }
                index += rows;
            }
            if (index == 0)
                throw new EmitException("the vector file has a header but no vectors",
                    "write one vector of 0/1 values per line", reader.Source);
        }
        finally
        {
            foreach (var s in states) s.Session?.Dispose();
        }

        return new VerifyReport
        {
            ToolVersion = ScorerPlan.ToolVersion,
            Model = request.ModelLabel,
            ModelSha256 = model.Sha256,
            ClassifierModels = classifier is null
                ? []
                : [(request.ModelLabel, model.Sha256), .. request.MoreModels.Select(m => (m.Label, m.Model.Sha256))],
            Input = reader.Source,
            Vectors = index,
            Threshold = model.Threshold,
            Targets = states.Select(s => s.Comparison.Finish(s.Runner.Name, s.Sources,
                request.GeneratedDirectory is null, model.Sha256, s.SelfTest, s.Failures, s.BuildSeconds,
                s.ScoreSeconds, s.Check, s.Features())).ToArray(),
            Warnings = warnings,
            AllowModelChange = request.AllowModelChange,
            FailOnDecisionMismatch = request.FailOnDecisionMismatch,
        };
    }

    /// <summary>
    /// The requested mode, or the one in the sources' manifest, or f32; a request that contradicts the manifest is an
    /// error.
    /// </summary>
    private static NumericMode ResolveMode(VerifyRequest request, IEnumerable<ScorerSources> sources)
    {
        NumericMode? recorded = null;
        foreach (var s in sources)
        {
            var m = s.Manifest.Numeric;
            if (recorded is { } other && other != m)
                throw new EmitException(
                    $"the C and C# sources were generated with different numeric modes ({other.ToText()}, " +
                    $"{m.ToText()})", $"regenerate them with the same {Setting.Numeric.Ref()}", s.Directory);
            recorded = m;
            if (request.Numeric is { } asked && asked != m)
                throw new EmitException(
                    $"{Path.GetFileName(s.SourceFile)} was generated with {Setting.Numeric.Ref()} {m.ToText()}, not " +
                    $"{asked.ToText()}",
                    $"pass {Setting.Numeric.Ref()} {m.ToText()}, or leave {Setting.Numeric.Ref()} out to take it " +
                    "from the manifest", s.ManifestPath);
        }
        return request.Numeric ?? recorded ?? NumericMode.F32;
    }

    /// <summary>
    /// Fixed-point options: those requested, else the manifest's; a request that contradicts the manifest is an error.
    /// </summary>
    private static FixedPointOptions ResolveFixed(VerifyRequest request, IEnumerable<ScorerSources> sources)
    {
        FixedPointOptions? recorded = null;
        foreach (var s in sources)
        {
            var m = s.Manifest.Fixed ?? new FixedPointOptions();
            if (recorded is not null && recorded != m)
                throw new EmitException("the C and C# sources were generated with different fixed-point options",
                    "regenerate them with the same options", s.Directory);
            recorded = m;
            if (request.Fixed is { } asked && asked != m)
                throw new EmitException(
                    $"{Path.GetFileName(s.SourceFile)} was generated with other fixed-point options ({Describe(m)}), " +
                    $"not {Describe(asked)}",
                    "leave --weights, --accumulator and --softplus-table out to take them from the manifest",
                    s.ManifestPath);
        }
        return request.Fixed ?? recorded ?? new FixedPointOptions();
    }

    /// <summary>
    /// The alarm filter: the one requested, else the manifest's (none when neither has one); a request that
    /// contradicts the manifest is an error.
    /// </summary>
    private static Emit.Detection.AlarmFilterSpec? ResolveFilter(VerifyRequest request,
        IEnumerable<ScorerSources> sources)
    {
        foreach (var s in sources)
        {
            var m = s.Manifest.AlarmFilter;
            if (request.AlarmFilter is { } asked && asked != m)
                throw new EmitException(
                    $"{Path.GetFileName(s.SourceFile)} was generated " +
                    (m is null ? "without an alarm filter" : $"with the alarm filter {m}") + $", not {asked}",
                    "leave --alarm-filter out to take it from the manifest", s.ManifestPath);
            return m;
        }
        return request.AlarmFilter;
    }

    private static string Describe(FixedPointOptions o) =>
        $"--weights {o.Weights.ToText()} --accumulator {(o.Accumulator is { } a ? a.ToText() : "auto")} " +
        $"--softplus-table {o.SoftplusTableSize.ToString(System.Globalization.CultureInfo.InvariantCulture)}";

    private sealed class State(ITargetRunner runner, ScorerSources sources, TargetComparison comparison,
        SourceCheckResult? check)
    {
        public SourceCheckResult? Check { get; } = check;
        public ITargetRunner Runner { get; } = runner;
        public ScorerSources Sources { get; } = sources;
        public TargetComparison Comparison { get; } = comparison;
        public IScorerSession? Session { get; set; }
        public int? SelfTest { get; set; }
        public List<string> Failures { get; } = [];
        public double BuildSeconds { get; set; }
        public double ScoreSeconds { get; set; }
        public StreamCheck? Stream { get; set; }
        public ExplainCheck? Explain { get; set; }
        public FilterCheck? Filter { get; set; }
        public ClassifyCheck? Classify { get; set; }

        /// <summary>The results of the features checked on this target.</summary>
        public IReadOnlyList<FeatureResult> Features() =>
            new[] { Stream?.Result(), Explain?.Result(), Filter?.Finish(), Classify?.Finish() }
                .OfType<FeatureResult>().ToArray();
    }
}
