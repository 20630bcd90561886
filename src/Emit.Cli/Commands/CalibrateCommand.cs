using System.CommandLine;
using System.Security.Cryptography;
using Emit.Detection;
using Emit.Model;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit calibrate MODEL --normal DATA --false-alarm A</c>: the conformal threshold for a false-alarm rate, with its
/// exact interval, detection rate and ROC AUC on known anomalies, a K-of-N alarm filter over a time-ordered log
/// (alarms per day), and the model written with the threshold (docs/calibrate.md).
/// </summary>
public sealed class CalibrateCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model = new Argument<FileInfo>("MODEL") { Description = "The model to calibrate (.json or .npz)" }.AcceptExistingOnly();
    private readonly Option<string> _normal = new("--normal") { Description = "Normal vectors (CSV of 0/1, one per line, in time order for --alarm-filter), or - for standard input", Required = true };
    private readonly Option<double?> _falseAlarm = new("--false-alarm") { Description = "False-alarm rate A the threshold allows, e.g. 0.01 (conformal: the ceil((n+1)(1-A))-th smallest normal free energy)" };
    private readonly Option<string?> _anomalies = new("--anomalies") { Description = "Known anomalous vectors: detection rate, ROC AUC and the rate table" };
    private readonly Option<string[]> _episodes = new("--episodes")
    {
        Description = "Anomaly episodes, one file per episode, each in time order: mean reports until the filter raises the alarm",
        AllowMultipleArgumentsPerToken = true,
    };
    private readonly Option<string?> _alarmFilter = new("--alarm-filter") { Description = "K/N: alarm when K of the last N reports are unusual (1 <= K <= N <= 32); runs over --normal as one time-ordered log" };
    private readonly Option<string?> _samplePeriod = new("--sample-period") { Description = "Time between rows of --normal (250ms, 30s, 5m, 1h, 1d): alarms per day" };
    private readonly Option<double?> _target = new("--target-alarms-per-day") { Description = "Search the threshold so the --alarm-filter raises at most this many alarms per day on --normal (instead of --false-alarm)" };
    private readonly Option<bool> _json = new("--json") { Description = "Print the report as JSON instead of text" };
    private readonly Option<FileInfo?> _output = new("--output", "-o") { Description = "Write the model with the threshold set and the calibration in its metadata (- for standard output)" };
    private readonly Option<FileInfo?> _report = new("--report") { Description = "Also write the JSON report to this file" };
    private readonly Option<FileInfo?> _plot = new("--plot") { Description = "Histograms with the threshold, and the ROC curve with --anomalies (.png or .svg)" };
    private readonly Option<bool> _force = CliOptions.Force();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("calibrate", "Set the threshold at a false-alarm rate from normal data, with its exact interval; detection rate and ROC AUC on anomalies")
        {
            _model, _normal, _falseAlarm, _anomalies, _episodes, _alarmFilter, _samplePeriod, _target, _json, _output, _report, _plot, _force,
        };
        cmd.SetAction(parse => Run(ctx, parse));
        return cmd;
    }

    private int Run(CliContext ctx, ParseResult parse)
    {
        var modelPath = parse.GetRequiredValue(_model).FullName;
        var model = ModelLoader.Load(modelPath);
        bool force = parse.GetValue(_force);
        var output = parse.GetValue(_output);
        bool modelToStdout = output?.Name == "-";
        if (modelToStdout && parse.GetValue(_json))
            throw new EmitException("--json and --output - both write to standard output", "write the model to a file, or drop --json");

        var normalPath = parse.GetRequiredValue(_normal);
        var (normal, normalSha) = ReadHashed(model, normalPath, ctx.In);
        double[]? anomalies = parse.GetValue(_anomalies) is { } ap ? Read(model, ap, ctx.In) : null;
        var episodePaths = parse.GetValue(_episodes) ?? [];
        var episodes = episodePaths.Length > 0 ? episodePaths.Select(p => (IReadOnlyList<double>)Read(model, p, ctx.In)).ToList() : null;

        var request = new CalibrationRequest
        {
            Normal = normal,
            FalseAlarm = parse.GetValue(_falseAlarm),
            Anomalies = anomalies,
            Filter = parse.GetValue(_alarmFilter) is { } f ? Named("--alarm-filter", () => AlarmFilterSpec.Parse(f)) : null,
            SamplePeriodSeconds = parse.GetValue(_samplePeriod) is { } sp ? Named("--sample-period", () => SamplePeriod.ParseSeconds(sp)) : null,
            TargetAlarmsPerDay = parse.GetValue(_target),
            Episodes = episodes,
            EpisodeNames = episodes is null ? null : episodePaths.Select(p => p == VectorReader.StdinPath ? VectorReader.StdinName : Path.GetFileName(p)).ToList(),
        };
        if (request.FalseAlarm is null && request.TargetAlarmsPerDay is null)
            throw new EmitException("no false-alarm rate given", "add --false-alarm A (e.g. 0.01), or --target-alarms-per-day X with --alarm-filter and --sample-period");
        if (request.FalseAlarm is not null && request.TargetAlarmsPerDay is not null)
            throw new EmitException("--false-alarm and --target-alarms-per-day both set the threshold", "give one of them");
        if (request.TargetAlarmsPerDay is not null && (request.Filter is null || request.SamplePeriodSeconds is null))
            throw new EmitException("--target-alarms-per-day needs --alarm-filter K/N and --sample-period", "e.g. --alarm-filter 3/5 --sample-period 5m");
        var report = Calibrator.Run(request);

        var normalName = normalPath == VectorReader.StdinPath ? VectorReader.StdinName : Path.GetFileName(normalPath);
        var calibrated = CalibrationMetadata.Apply(model, report, normalSha, normalName);
        var source = new CalibrationSource(Path.GetFileName(modelPath), calibrated.Sha256, normalName, normalSha,
            parse.GetValue(_anomalies) is { } an ? (an == VectorReader.StdinPath ? VectorReader.StdinName : Path.GetFileName(an)) : null);

        if (output is not null)
        {
            if (modelToStdout) ctx.Out.Write(ModelJson.ToText(calibrated));
            else ModelJson.WriteFile(calibrated, output.FullName, force);
        }
        if (parse.GetValue(_report) is { } reportFile)
        {
            var text = new StringWriter { NewLine = "\n" };
            JsonOut.Write(text, w => CalibrationJson.Write(w, report, source));
            AtomicFile.WriteAllText(reportFile.FullName, text.ToString(), force);
        }
        if (parse.GetValue(_plot) is { } plot)
            CalibrationPlot.Write(report, source.ModelName, plot.FullName, force);
        if (modelToStdout) return CliApp.Ok;
        if (parse.GetValue(_json)) JsonOut.Write(ctx.Out, w => CalibrationJson.Write(w, report, source));
        else CalibrationText.Write(ctx.Out, report, source);
        return CliApp.Ok;
    }

    /// <summary>Runs <paramref name="body"/>, naming <paramref name="option"/> in an error it raises.</summary>
    private static T Named<T>(string option, Func<T> body)
    {
        try
        {
            return body();
        }
        catch (EmitException e) when (e.File is null)
        {
            throw new EmitException(option + ": " + e.Problem, e.Hint, null, null, null, e);
        }
    }

    private static double[] Read(BoltzmannModel model, string path, Stream? stdin)
    {
        using var reader = VectorReader.Open(path, model.Visible, stdin);
        VectorNames.Check(model, reader);
        return EnergyLog.Score(model, reader);
    }

    /// <summary>The free energies of a data file and the SHA-256 of its bytes (standard input is read into memory).</summary>
    private static (double[] Energies, string Sha256) ReadHashed(BoltzmannModel model, string path, Stream? stdin)
    {
        if (path == VectorReader.StdinPath)
        {
            var ms = new MemoryStream();
            (stdin ?? Console.OpenStandardInput()).CopyTo(ms);
            var sha = Convert.ToHexStringLower(SHA256.HashData(ms.ToArray()));
            ms.Position = 0;
            using var reader = new VectorReader(ms, VectorReader.StdinName, model.Visible);
            VectorNames.Check(model, reader);
            return (EnergyLog.Score(model, reader), sha);
        }
        var energies = Read(model, path, stdin);
        using var file = File.OpenRead(path);
        return (energies, Convert.ToHexStringLower(SHA256.HashData(file)));
    }
}
