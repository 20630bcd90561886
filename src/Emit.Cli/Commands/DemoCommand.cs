using System.CommandLine;
using System.Diagnostics;
using System.Globalization;
using System.Security.Cryptography;
using System.Text;
using System.Text.Json;
using Emit.Analysis;
using Emit.Demo;
using Emit.Detection;
using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;
using Emit.Training;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit demo [--out DIR] [--data DIR]</c>: the integrator's whole loop on the invented reefer-fleet scenario
/// (demo-data/README.md): draw the logs, train, calibrate at a stated false-alarm rate, compile C and C# in f32 and
/// fixed int16, verify the generated code against the reference scorer on every target whose tools are present,
/// explain two faulty reports, diff against the shipped model, and one summary table.
/// </summary>
public sealed class DemoCommand : ICliCommand
{
    /// <summary>The false-alarm rate the demo calibrates at (the shipped model's, see demo-data/README.md).</summary>
    public const double FalseAlarm = 0.005;

    /// <summary>Faults whose first detected report the demo explains: one blatant, one touching two flags.</summary>
    private static readonly string[] ExplainedFaults = ["condenser_fan_failure", "frozen_cargo_ventilated"];

    private const int TopFlags = 3;

    private readonly Option<DirectoryInfo?> _out = new("--out")
    {
        Description = "Folder to keep every file in (logs, model, calibration report and plot, generated sources " +
            "with manifests, verify reports, explanations); default: a temporary folder deleted at the end",
        HelpName = "DIR",
    };
    private readonly Option<DirectoryInfo?> _data = new Option<DirectoryInfo?>("--data")
    {
        Description = "Folder with the shipped demo files to compare with (default: demo-data/ in this folder or a " +
            "parent; without one the comparison is skipped)",
        HelpName = "DIR",
    }.MustExist();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("demo",
            "Run the whole loop on an invented fleet of refrigerated containers reporting 56 status flags: " +
            "generate logs, train, calibrate, compile C and C# (f32, fixed int16), verify, explain")
        {
            _out,
            _data,
        };
        cmd.SetAction(parse =>
        {
            string? shipped = parse.GetValue(_data)?.FullName;
            if (shipped is not null && !File.Exists(Path.Combine(shipped, DemoData.ModelFileName)))
                throw new EmitException($"no {DemoData.ModelFileName} in {shipped}",
                    "pass the demo-data/ folder of the emit repository");
            shipped ??= FindDemoData();
            var keep = parse.GetValue(_out)?.FullName;
            var dir = keep ?? Path.Combine(Path.GetTempPath(), "emit-demo-" + Guid.NewGuid().ToString("N")[..12]);
            try
            {
                new DemoRun(ctx.Out, dir, keep is not null, shipped).Run();
            }
            finally
            {
                if (keep is null)
                    try { Directory.Delete(dir,
                        recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
            }
            return CliApp.Ok;
        });
        return cmd;
    }

    /// <summary>
    /// demo-data/ in the current folder or the nearest parent that has one, else next to the tool; null when none.
    /// </summary>
    private static string? FindDemoData()
    {
        foreach (var start in new[] { Directory.GetCurrentDirectory(), AppContext.BaseDirectory })
            for (var d = new DirectoryInfo(start); d is not null; d = d.Parent)
                if (File.Exists(Path.Combine(d.FullName, "demo-data", DemoData.ModelFileName)))
                    return Path.Combine(d.FullName, "demo-data");
        return null;
    }

    /// <summary>One run of the demo: the steps in order, then the summary.</summary>
    private sealed class DemoRun(TextWriter o, string dir, bool keep, string? shipped)
    {
        private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
        private const string Indent = "             ";
        private readonly List<(string What, string Path)> _files = [];
        private readonly List<(string Scorer, CompiledScorer Compiled, VerifyReport? Report)> _scorers = [];

        private string Write(string what, string relative, string text)
        {
            var path = Path.Combine(dir, relative);
            AtomicFile.WriteAllText(path, text, force: false);
            _files.Add((what, relative));
            return path;
        }

        public void Run()
        {
            var clock = Stopwatch.StartNew();
            o.WriteLine(
                "emit demo: the integrator's loop on an invented fleet of refrigerated containers " +
                "(demo-data/README.md)");
            o.WriteLine(
                keep ? $"files go to {dir}"
                : $"files go to a temporary folder, {dir}, deleted at the end (give --out DIR to keep them)");
            o.WriteLine();

            // 1. logs
            var logs = DemoData.Logs();
            o.WriteLine(
                $"1. logs      {logs.Training.Length} training, {logs.Calibration.Length} calibration, " +
                $"{logs.Normal.Length} normal and " +
                        $"{logs.Faulty.Length} faulty reports of {ReeferFlags.Count} flags (generator " +
                        $"v{ReeferFleetGenerator.Version}, seed {DemoData.Seed})");
            Directory.CreateDirectory(Path.Combine(dir, "data"));
            Write("training log", Path.Combine("data", DemoData.TrainingFileName), DemoData.Csv(logs.Training));
            var calibrationText = DemoData.Csv(logs.Calibration);
            Write("calibration log", Path.Combine("data", "calibration.csv"), calibrationText);
            var normalPath = Write("normal log (held out)", Path.Combine("data", DemoData.NormalFileName),
                DemoData.Csv(logs.Normal));
            var faultyPath = Write("faulty log", Path.Combine("data", DemoData.FaultyFileName),
                DemoData.Csv(logs.Faulty));
            var faultsText = new StringBuilder("index,fault,mode\n");
            for (int k = 0; k < logs.Faulty.Length; k++)
                faultsText.Append(k.ToString(Inv)).Append(',').Append(logs.Faulty[k].Fault).Append(',')
                    .Append(logs.Faulty[k].Mode).Append('\n');
            Write("fault of each faulty report", Path.Combine("data", DemoData.FaultsFileName), faultsText.ToString());
            if (shipped is not null)
            {
                var differ = new[] { DemoData.NormalFileName, DemoData.FaultyFileName, DemoData.FaultsFileName }
                    .Where(f => !File.ReadAllBytes(Path.Combine(dir, "data", f)).AsSpan().SequenceEqual(
                        File.ReadAllBytes(Path.Combine(shipped, f))))
                    .ToList();
                o.WriteLine(Indent + (differ.Count == 0
                    ? $"normal.csv, faulty.csv and faults.csv are byte for byte those in {shipped}"
                    : $"DIFFER from {shipped}: {string.Join(", ", differ)} (regenerate demo-data/, see its README)"));
            }

            // 2. train
            var settings = DemoData.TrainerSettings;
            var sw = Stopwatch.StartNew();
            var trained = Trainer.Train(DemoData.TrainingData(logs.Training), settings);
            var epochs = trained.Epochs;
            o.WriteLine(
                $"2. train     emit train --data {DemoData.TrainingFileName} --hidden {settings.Hidden} --seed " +
                $"{settings.Seed} (the other settings emit train's defaults, docs/train.md)");
            o.WriteLine(
                Indent + $"{trained.Model.Kind.ToText()}, {trained.Model.Visible} visible, {trained.Model.Hidden} " +
                $"hidden; {epochs.Length} epochs in {sw.Elapsed.TotalSeconds:F1} s; " +
                        $"reconstruction error {G(epochs[0].ReconstructionError)} -> " +
                        $"{G(epochs[^1].ReconstructionError)}");
            BoltzmannModel? shippedModel = shipped is null ? null
                : ModelLoader.Load(Path.Combine(shipped, DemoData.ModelFileName));
            string sameWeights = "not compared (no demo-data/ found)";
            if (shippedModel is not null)
            {
                var m = trained.Model;
                bool same = m.VisibleBias.SequenceEqual(shippedModel.VisibleBias)
                    && m.HiddenBias.SequenceEqual(shippedModel.HiddenBias)
                            && m.Weights.SequenceEqual(shippedModel.Weights);
                sameWeights = same ? "equal to the shipped model's, bit for bit" : "DIFFER from the shipped model's";
                o.WriteLine(
                    Indent + $"weights and biases {sameWeights} ({Path.Combine(shipped!, DemoData.ModelFileName)})");
            }

            // 3. calibrate
            var reference = new ReferenceScorer(trained.Model);
            double[] Energies(IEnumerable<ReeferRow> rows) =>
                rows.Select(r => reference.FreeEnergy(r.Flags.AsSpan())).ToArray();
            var calibrationEnergies = Energies(logs.Calibration);
            var faultyEnergies = Energies(logs.Faulty);
            var outcome = Calibrator.Calibrate(trained.Model, DemoData.ModelFileName,
                new CalibrationRequest
                {
                    Normal = calibrationEnergies,
                    FalseAlarm = FalseAlarm,
                    Anomalies = faultyEnergies,
                },
                "calibration.csv", Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(calibrationText))),
                DemoData.FaultyFileName);
            var cal = outcome.Report;
            double threshold = DemoData.RoundThreshold(cal.Threshold);
            var model = outcome.Model.With(threshold, outcome.Model.LogPartition);
            o.WriteLine(
                $"3. calibrate emit calibrate --normal calibration.csv --false-alarm {FalseAlarm.ToString("R", Inv)} " +
                $"--anomalies {DemoData.FaultyFileName}");
            o.WriteLine(
                Indent + $"threshold {cal.Threshold.ToString("R", Inv)} (the {cal.Rank}-th smallest of " +
                $"{cal.NormalVectors}), rounded up to {threshold.ToString("R", Inv)} as the shipped model's; F(v) > " +
                "threshold is unusual");
            o.WriteLine(
                Indent + $"calibration log: {cal.Flagged} of {cal.NormalVectors} flagged, " +
                $"{Interval(cal.FalseAlarmInterval)}; ROC AUC on {DemoData.FaultyFileName} " +
                $"{cal.Anomalies!.RocAuc.ToString("F4", Inv)}");
            if (shippedModel is not null)
                o.WriteLine(
                    Indent + (shippedModel.Threshold == threshold ? "threshold equal to the shipped model's"
                        : "threshold DIFFERS from the shipped model's " +
                        $"({shippedModel.Threshold?.ToString("R", Inv)})"));
            var modelPath = Write("trained and calibrated model", DemoData.ModelFileName, ModelJson.ToText(model));
            Write("calibration report", "calibration.json", Json(w => outcome.WriteJson(w)));
            CalibrationPlot.Write(cal, DemoData.ModelFileName, Path.Combine(dir, "calibration.png"), force: false);
            _files.Add(("calibration plot (histograms, ROC)", "calibration.png"));

            // held-out figures: the rates the summary reports
            var normalEnergies = Energies(logs.Normal).Select(f => f > threshold).ToArray();
            int falseAlarms = normalEnergies.Count(x => x);
            var faultyFlagged = faultyEnergies.Select(f => f > threshold).ToArray();

            // 4. compile
            var name = Naming.ScorerNameFromFile(modelPath);
            var modes = new (string Folder, NumericMode Mode, FixedPointOptions? Fixed)[]
            {
                ("f32", NumericMode.F32, null),
                ("fixed-int16", NumericMode.Fixed, new FixedPointOptions(WeightType.Int16)),
            };
            foreach (var (folder, mode, fixedOptions) in modes)
            {
                var compiled = ScorerCompiler.Build(model, DemoData.ModelFileName,
                    new CompileOptions(["c", "csharp"], mode, name, Fixed: fixedOptions));
                OutputFolder.Write(Path.Combine(dir, folder), compiled, force: false);
                foreach (var f in compiled.AllFiles)
                    _files.Add(($"generated ({folder})", Path.Combine(folder, f.FileName)));
                _scorers.Add((folder, compiled, null));
            }
            o.WriteLine(
                $"4. compile   emit compile --target c,csharp --numeric f32 | --numeric fixed --weights int16: " +
                        $"{_scorers[0].Compiled.AllFiles.Count} files each (sources and " +
                        $"{SourceManifest.FileNameFor(name)})");

            // 5. verify
            var targets = new List<string> { "c", "csharp" };
            string? m3Missing = null;
            try
            {
                Runners.Find("cortex-m3")!.CheckTools(new RunnerSettings());
                targets.Add("cortex-m3");
            }
            catch (EmitException e)
            {
                m3Missing = e.OneLine();
            }
            o.WriteLine(
                $"5. verify    emit verify --generated DIR --target {string.Join(',', targets)} --input " +
                $"{DemoData.NormalFileName} ({logs.Normal.Length} vectors)");
            if (m3Missing is not null) o.WriteLine(Indent + "the emulated Cortex-M3 is not run: " + m3Missing);
            for (int s = 0; s < _scorers.Count; s++)
            {
                var (folder, compiled, _) = _scorers[s];
                VerifyReport report;
                try
                {
                    report = Verifier.Run(new VerifyRequest
                    {
                        Model = model,
                        ModelLabel = DemoData.ModelFileName,
                        InputPath = normalPath,
                        Targets = targets,
                        GeneratedDirectory = Path.Combine(dir, folder),
                        Name = name,
                    });
                }
                catch (EmitException e)
                {
                    o.WriteLine(Indent + $"{folder}: not run: {e.OneLine()}");
                    continue;
                }
                _scorers[s] = (folder, compiled, report);
                Write($"verify report ({folder})", $"verify-{folder}.json", Json(w => ReportJson.Write(report, w)));
                foreach (var t in report.Targets)
                    o.WriteLine(
                        Indent + $"{folder,-11} {t.Target,-9} {t.Vectors} vectors, max |error| {G(t.MaxAbsError)} " +
                        $"nats (bound {G(t.ErrorBound)})" +
                                (t.BitExact is { } exact ? $", bit-exact with the simulator: {(exact ? "yes" : "NO")}"
                                    : "") +
                                $", {t.DecisionMismatches} decision mismatches: " +
                                $"{(t.Passed ? "pass" : "FAIL: " + string.Join("; ", t.Failures))} ({t.Seconds:F1} s)");
            }

            // 6. explain
            var explainer = new UnitFlipExplainer(model);
            var explained = new StringBuilder("index,rank,unit,name,delta_free_energy\n");
            o.WriteLine(
                $"6. explain   emit explain --input {DemoData.FaultyFileName} --top {TopFlags}: the flags whose flip " +
                "lowers F most, for the first detected report of two faults");
            foreach (var fault in ExplainedFaults)
            {
                int k = Enumerable.Range(0, logs.Faulty.Length).FirstOrDefault(
                    i => logs.Faulty[i].Fault == fault && faultyFlagged[i], -1);
                if (k < 0) { o.WriteLine(Indent + $"{fault}: no report detected"); continue; }
                var top = explainer.Top(logs.Faulty[k].Flags.AsSpan(), TopFlags);
                o.WriteLine(Indent + $"report {k} ({fault}, F = {faultyEnergies[k].ToString("F3", Inv)}): " +
                            string.Join(", ",
                                top.Select(
                                    u => $"{model.Names[u.Unit]}={logs.Faulty[k].Flags[u.Unit]} (ΔF " +
                                    $"{u.DeltaFreeEnergy.ToString("F2", Inv)})")));
                for (int r = 0; r < top.Count; r++)
                {
                    var unit = top[r].Unit;
                    explained.Append(Inv, $"{k},{r + 1},{unit},{model.Names[unit]},")
                        .Append(Inv, $"{ModelJson.Number(top[r].DeltaFreeEnergy)}\n");
                }
            }
            Write("explanations", "explain.csv", explained.ToString());

            // 7. diff against the model shipped before
            if (shippedModel is not null)
            {
                o.WriteLine(
                    $"7. diff      emit diff {Path.Combine("demo-data", DemoData.ModelFileName)} " +
                    $"{DemoData.ModelFileName} (the shipped model against the one just made):");
                foreach (var path in new[] { normalPath, faultyPath })
                {
                    using var reader = VectorReader.Open(path, model.Visible);
                    var d = ModelDiff.Compare(shippedModel, model, reader).Decisions!;
                    o.WriteLine(
                        Indent + $"{Path.GetFileName(path)}: {d.NewlyUnusual} newly unusual, {d.NoLongerUnusual} no " +
                        $"longer unusual, {d.BothUnusual + d.BothUsual} unchanged");
                }
            }

            Summary(logs, faultyFlagged, falseAlarms, threshold, sameWeights, m3Missing);
            o.WriteLine();
            o.WriteLine($"Caution: this detector is {DetectionCaution.Text}");
            o.WriteLine(
                keep ? $"Done in {clock.Elapsed.TotalSeconds:F0} s; the files are in {dir}."
                : $"Done in {clock.Elapsed.TotalSeconds:F0} s; the temporary files were deleted.");
        }

        private void Summary(DemoLogs logs, bool[] faultyFlagged, int falseAlarms, double threshold, string sameWeights,
            string? m3Missing)
        {
            var rows = new List<(string Item, string Value)>();
            var byFault = logs.Faulty.Select((r, i) => (r.Fault!, faultyFlagged[i])).GroupBy(x => x.Item1)
                .Select(g => (Fault: g.Key, Detected: g.Count(x => x.Item2), Total: g.Count()))
                .OrderByDescending(g => g.Detected / (double)g.Total).ThenBy(g => g.Fault,
                    StringComparer.Ordinal).ToList();
            foreach (var g in byFault)
                rows.Add(($"detected: {g.Fault}", $"{g.Detected} of {g.Total} ({Pct(g.Detected, g.Total)})"));
            int detected = faultyFlagged.Count(x => x);
            rows.Add(
                ("detected: all faults",
                    $"{detected} of {faultyFlagged.Length} ({Pct(detected, faultyFlagged.Length)})"));
            var fa = ClopperPearson.Interval(falseAlarms, logs.Normal.Length);
            rows.Add(
                ($"false alarms on {DemoData.NormalFileName}",
                    $"{falseAlarms} of {logs.Normal.Length} ({Pct(falseAlarms, logs.Normal.Length)}), " +
                    $"{Interval(fa)}; calibrated for {FalseAlarm.ToString("R", Inv)} at threshold " +
                    $"{threshold.ToString("R", Inv)}"));
            rows.Add(("trained weights", sameWeights));
            foreach (var (folder, compiled, report) in _scorers)
            {
                var fp = FootprintModel.Predict(compiled.Plan);
                string measured = report is null ? "not verified"
                    : string.Join(", ",
                        report.Targets.Select(t => $"{G(t.MaxAbsError)} ({t.Target}{(t.Passed ? "" : ", FAILED")})"));
                rows.Add(
                    ($"scorer {folder}: error bound",
                        $"{G(compiled.Manifest.ErrorBound)} nats stated; largest measured {measured}"));
                rows.Add(
                    ($"scorer {folder}: footprint",
                        $"{fp.FlashBytes} bytes flash, {fp.StackBytes} bytes stack predicted ({fp.Reference})"));
            }
            if (m3Missing is not null) rows.Add(("emulated Cortex-M3", "not run: " + m3Missing));
            foreach (var g in _files.GroupBy(f => f.What))
                rows.Add(($"file: {g.Key}", string.Join(", ", g.Select(f => f.Path))));

            int width = rows.Max(r => r.Item.Length);
            o.WriteLine();
            o.WriteLine($"Summary (files relative to {(keep ? dir : "the temporary folder")})");
            o.WriteLine($"  {"item".PadRight(width)}  value");
            o.WriteLine($"  {new string('-', width)}  {new string('-', 5)}");
            foreach (var (item, value) in rows) o.WriteLine($"  {item.PadRight(width)}  {value}");
        }

        private static string Json(Action<Utf8JsonWriter> body)
        {
            using var stream = new MemoryStream();
            using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true, NewLine = "\n" }))
                body(w);
            return Encoding.UTF8.GetString(stream.ToArray()) + "\n";
        }

        private static string Pct(int k, int n) => (100.0 * k / n).ToString("F2", Inv) + " %";

        private static string Interval(RateInterval i) =>
            $"{(i.Confidence * 100).ToString("0.#", Inv)} % interval [{(100 * i.Low).ToString("F2", Inv)} %, " +
            $"{(100 * i.High).ToString("F2", Inv)} %] (Clopper–Pearson)";

        private static string G(double? x) => x?.ToString("G3", Inv).ToLowerInvariant() ?? "-";
    }
}
