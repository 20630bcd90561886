using System.CommandLine;
using System.Globalization;
using Emit.Analysis;
using Emit.Quantize;
using Emit.Demo;
using Emit.Detection;
using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit demo [--data DIR]</c>: runs the pipeline on the shipped reefer-fleet demo (demo-data/): the model,
/// its exact log Z, how its threshold separates the normal and faulty logs, fault by fault, and the generated C scorer
/// compiled and verified against the reference on the host.
/// </summary>
public sealed class DemoCommand : ICliCommand
{
    private readonly Option<DirectoryInfo?> _data = new Option<DirectoryInfo?>("--data") { Description = "Folder with the demo files (default: demo-data/ in this folder or a parent)", HelpName = "DIR" }.MustExist();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("demo", "Run emit on the shipped demo: an invented fleet of refrigerated containers reporting 56 status flags")
        {
            _data,
        };
        cmd.SetAction(parse =>
        {
            var dir = parse.GetValue(_data)?.FullName ?? FindDemoData();
            Run(ctx.Out, dir);
            return CliApp.Ok;
        });
        return cmd;
    }

    /// <summary>demo-data/ in the current folder or the nearest parent that has one, else next to the tool.</summary>
    private static string FindDemoData()
    {
        foreach (var start in new[] { Directory.GetCurrentDirectory(), AppContext.BaseDirectory })
            for (var d = new DirectoryInfo(start); d is not null; d = d.Parent)
                if (File.Exists(Path.Combine(d.FullName, "demo-data", DemoData.ModelFileName)))
                    return Path.Combine(d.FullName, "demo-data");
        throw new EmitException("cannot find demo-data/ here or in a parent folder", "run from the emit repository, or pass --data DIR");
    }

    private static void Run(TextWriter o, string dir)
    {
        string P(string file) => Path.Combine(dir, file);
        var inv = CultureInfo.InvariantCulture;
        var model = ModelLoader.Load(P(DemoData.ModelFileName));
        o.WriteLine("emit demo: a fleet of refrigerated containers (invented scenario, see demo-data/README.md)");
        o.WriteLine();
        o.WriteLine($"1. model     {DemoData.ModelFileName}: {model.Kind.ToText()}, {model.Visible} status flags, {model.Hidden} hidden units");
        o.WriteLine($"             sha256 {model.Sha256}");
        var threshold = model.Threshold ?? throw new EmitException("the demo model has no threshold", null, P(DemoData.ModelFileName));
        o.WriteLine($"             threshold F(v) > {threshold.ToString("R", inv)} means unusual");

        var z = ExactLogPartition.Compute(model);
        o.WriteLine($"2. log Z     {z.LogPartition.ToString("F6", inv)} (exact over {z.Enumerated}, {z.Seconds:F2} s)");

        var normal = Score(model, P(DemoData.NormalFileName));
        var faulty = Score(model, P(DemoData.FaultyFileName));
        int normalFlagged = normal.Count(f => f > threshold), faultyFlagged = faulty.Count(f => f > threshold);
        o.WriteLine($"3. scoring   {DemoData.NormalFileName}: {normalFlagged} of {normal.Count} flagged ({100.0 * normalFlagged / normal.Count:F2} % false alarms)");
        o.WriteLine($"             {DemoData.FaultyFileName}: {faultyFlagged} of {faulty.Count} flagged ({100.0 * faultyFlagged / faulty.Count:F2} % detected)");
        var median = normal.Order().ElementAt(normal.Count / 2);
        o.WriteLine($"             median F on normal logs {median.ToString("F3", inv)}; mean log p(v) {normal.Average(f => -f - z.LogPartition).ToString("F3", inv)} nats");

        var faults = File.ReadLines(P("faults.csv")).Skip(1).Select(l => l.Split(',')[1]).ToList();
        o.WriteLine("             detected by fault:");
        foreach (var g in faults.Select((name, i) => (name, flagged: faulty[i] > threshold)).GroupBy(x => x.name).OrderByDescending(g => g.Count(x => x.flagged) / (double)g.Count()))
            o.WriteLine($"               {g.Key,-32} {g.Count(x => x.flagged),3} / {g.Count(),-3}");
        CompileAndVerify(o, model, P(DemoData.ModelFileName), P(DemoData.NormalFileName));
        Recalibrate(o, model, normal, P(DemoData.NormalFileName), P(DemoData.FaultyFileName));
        o.WriteLine();
        o.WriteLine("Caution: this detector is a monitoring aid, not a safety function; defer to local codes and licensed practice.");
    }

    /// <summary>
    /// Steps 4 and 5: compile the model to C (f32) in a temporary folder and verify those sources on the host C compiler
    /// over the normal logs, as QA would in CI. Without a C compiler the step says what to install and is skipped.
    /// </summary>
    private static void CompileAndVerify(TextWriter o, BoltzmannModel model, string modelPath, string vectorsPath)
    {
        var name = Naming.ScorerNameFromFile(modelPath);
        var dir = Path.Combine(Path.GetTempPath(), "emit-demo-" + Guid.NewGuid().ToString("N")[..12]);
        try
        {
            var compiled = ScorerCompiler.Build(model, Path.GetFileName(modelPath), new CompileOptions(["c"], NumericMode.F32, name));
            OutputFolder.Write(dir, compiled, force: false);
            var files = compiled.Files;
            var bound = compiled.Manifest.ErrorBound;     // the bound the header states, from the manifest (docs/manifest.md)
            o.WriteLine($"4. compile   emit compile --target c --numeric f32: {string.Join(", ", files.Select(f => $"{f.FileName} ({f.Text.Length / 1024.0:F0} KiB)"))}");
            o.WriteLine($"             stated error bound {G(bound)} nats; self-test of {CompileOptions.DefaultSelfTestVectors} embedded vectors");
            VerifyReport report;
            try
            {
                report = Verifier.Run(new VerifyRequest
                {
                    Model = model,
                    ModelLabel = Path.GetFileName(modelPath),
                    InputPath = vectorsPath,
                    Targets = ["c"],
                    GeneratedDirectory = dir,
                    Name = name,
                });
            }
            catch (EmitException e)
            {
                o.WriteLine($"5. verify    skipped: {e.OneLine()}");
                return;
            }
            var t = report.Targets[0];
            o.WriteLine($"5. verify    emit verify --target c over {Path.GetFileName(vectorsPath)}: {t.Vectors} vectors on the host C compiler (strict flags)");
            o.WriteLine($"             max |error| {G(t.MaxAbsError)} nats, mean {G(t.MeanAbsError)}, bound {G(t.ErrorBound)}; " +
                        $"{t.DecisionMismatches} decision mismatches ({t.UnexplainedMismatches} unexplained): {(t.Passed ? "pass" : "FAIL: " + string.Join("; ", t.Failures))}");
            o.WriteLine("             (emit verify MODEL --input DATA --target c,csharp,cortex-m3 adds .NET and an emulated Cortex-M3)");
        }
        finally
        {
            try { Directory.Delete(dir, recursive: true); } catch (IOException) { } catch (UnauthorizedAccessException) { }
        }
    }

    /// <summary>
    /// Step 6: what an integrator checks before shipping a recalibration: the same model with its threshold recalibrated
    /// at a false-alarm rate of 0.01 on the normal logs (as <c>emit calibrate</c> does), compared with the shipped one
    /// by <c>emit diff</c> on both logs.
    /// </summary>
    private static void Recalibrate(TextWriter o, BoltzmannModel model, List<double> normal, string normalPath, string faultyPath)
    {
        double t99 = ConformalThreshold.Threshold(normal, 0.01);
        var candidate = model.With(t99, model.LogPartition);
        o.WriteLine($"6. diff      a recalibration at false-alarm rate 0.01 on {Path.GetFileName(normalPath)} (threshold {t99.ToString("F3", CultureInfo.InvariantCulture)}, emit calibrate), " +
                    "against the shipped model (emit diff OLD NEW --input DATA):");
        foreach (var path in new[] { normalPath, faultyPath })
        {
            using var reader = VectorReader.Open(path, model.Visible);
            var d = ModelDiff.Compare(model, candidate, reader).Decisions!;
            o.WriteLine($"             {Path.GetFileName(path)}: {d.NewlyUnusual} newly unusual, {d.NoLongerUnusual} no longer unusual, {d.BothUnusual + d.BothUsual} unchanged");
        }
    }

    private static string G(double? x) => x?.ToString("G3", CultureInfo.InvariantCulture).ToLowerInvariant() ?? "-";

    private static List<double> Score(BoltzmannModel model, string path)
    {
        var scorer = new ReferenceScorer(model);
        using var reader = VectorReader.Open(path, model.Visible);
        var list = new List<double>();
        var row = new byte[model.Visible];
        while (reader.TryRead(row)) list.Add(scorer.FreeEnergy(row));
        return list;
    }
}
