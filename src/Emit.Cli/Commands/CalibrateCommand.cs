using System.CommandLine;
using System.Globalization;
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
    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "The model to calibrate (.json or .npz)" }.AcceptExistingOnly();
    private readonly Option<string> _normal = new("--normal")
    {
        HelpName = "DATA",
        Description = "Normal vectors (CSV of 0/1, one per line, in time order for --alarm-filter), or - for " +
            "standard input",
        Required = true,
    };
    private readonly Option<string?> _falseAlarm = new("--false-alarm")
    {
        HelpName = "A",
        Description = "False-alarm rate A the threshold allows, e.g. 0.01 (conformal: the ceil((n+1)(1-A))-th " +
            "smallest normal free energy)",
    };
    private readonly Option<string?> _anomalies = new("--anomalies")
    {
        HelpName = "DATA",
        Description = "Known anomalous vectors: detection rate, ROC AUC and the rate table",
    };
    private readonly Option<string[]> _episodes = new("--episodes")
    {
        HelpName = "FILE",
            Description = "Anomaly episodes, one file per episode, each in time order: mean reports until the filter " +
            "raises the alarm",
        AllowMultipleArgumentsPerToken = true,
    };
    private readonly Option<string?> _alarmFilter = new("--alarm-filter")
    {
        HelpName = "K/N",
        Description = "K/N: alarm when K of the last N reports are unusual (1 <= K <= N <= 32); runs over --normal " +
            "as one time-ordered log",
    };
    private readonly Option<string?> _samplePeriod = new("--sample-period")
    {
        HelpName = "DURATION",
        Description = "Time between rows of --normal (250ms, 30s, 5m, 1h, 1d): alarms per day",
    };
    private readonly Option<string?> _target = new("--target-alarms-per-day")
    {
        HelpName = "X",
        Description = "Search the threshold so the --alarm-filter raises at most this many alarms per day on " +
            "--normal (instead of --false-alarm)",
    };
    private readonly Option<bool> _json = new("--json") { Description = "Print the report as JSON instead of text" };
    private readonly Option<FileInfo?> _output = new("--output", "-o")
    {
        HelpName = "OUT.json",
        Description = "Write the model with the threshold set and the calibration in its metadata (- for standard " +
            "output)",
    };
    private readonly Option<FileInfo?> _report = new("--report")
    {
        HelpName = "FILE.json",
        Description = "Also write the JSON report to this file",
    };
    private readonly Option<FileInfo?> _plot = new("--plot")
    {
        HelpName = "FILE.png|FILE.svg",
        Description = "Histograms with the threshold, and the ROC curve with --anomalies (.png or .svg)",
    };
    private readonly Option<bool> _force = CliOptions.Force();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("calibrate",
            "Set the threshold at a false-alarm rate from normal data, with its exact interval; detection rate and " +
            "ROC AUC on anomalies. A monitoring aid, not a safety function")
        {
            _model, _normal, _falseAlarm, _anomalies, _episodes, _alarmFilter, _samplePeriod, _target, _json, _output,
                _report, _plot, _force,
        };
        cmd.SetAction(parse => Run(ctx, parse));
        return cmd;
    }

    private int Run(CliContext ctx, ParseResult parse)
    {
        var modelPath = parse.GetRequiredValue(_model).FullName;
        string?[] inputs = [modelPath, parse.GetRequiredValue(_normal), parse.GetValue(_anomalies),
            .. parse.GetValue(_episodes) ?? []];
        foreach (var written in new[] { parse.GetValue(_output)?.ToString(), parse.GetValue(_report)?.FullName,
            parse.GetValue(_plot)?.FullName })
            AtomicFile.RefuseInput(written is null || written == "-" ? null : System.IO.Path.GetFullPath(written),
                inputs);
        var model = ModelLoader.Load(modelPath);
        bool force = parse.GetValue(_force);
        var output = parse.GetValue(_output);
        bool modelToStdout = output?.Name == "-";
        if (modelToStdout && parse.GetValue(_json))
            throw new EmitException("--json and --output - both write to standard output",
                "write the model to a file, or drop --json");

        // options first, so that a typo is reported before the data is read
        var falseAlarm = Number("--false-alarm", parse.GetValue(_falseAlarm));
        var target = Number("--target-alarms-per-day", parse.GetValue(_target));
        var filter = parse.GetValue(_alarmFilter) is { } f ? Named("--alarm-filter", () => AlarmFilterSpec.Parse(f))
            : null;
        double? period = parse.GetValue(_samplePeriod) is { } sp
            ? Named("--sample-period", () => SamplePeriod.ParseSeconds(sp)) : null;
        if (falseAlarm is null && target is null)
            throw new EmitException("no false-alarm rate given",
                "add --false-alarm A (e.g. 0.01), or --target-alarms-per-day X with --alarm-filter and " +
                "--sample-period");
        if (falseAlarm is not null && target is not null)
            throw new EmitException("--false-alarm and --target-alarms-per-day both set the threshold",
                "give one of them");
        if (target is not null && (filter is null || period is null))
            throw new EmitException("--target-alarms-per-day needs --alarm-filter K/N and --sample-period",
                "e.g. --alarm-filter 3/5 --sample-period 5m");
        if (parse.GetValue(_plot) is { } plotFile) CalibrationPlot.IsSvg(plotFile.FullName);

        var normalPath = parse.GetRequiredValue(_normal);
        var (normal, normalSha) = EnergyLog.ScoreFileHashed(model, normalPath, ctx.In);
        var anomaliesPath = parse.GetValue(_anomalies);
        var anomalies = anomaliesPath is null ? null : EnergyLog.ScoreFile(model, anomaliesPath, ctx.In);
        var episodePaths = parse.GetValue(_episodes) ?? [];
        var episodes = episodePaths.Length > 0
            ? episodePaths.Select(p => (IReadOnlyList<double>)EnergyLog.ScoreFile(model, p, ctx.In)).ToList() : null;
        var request = new CalibrationRequest
        {
            Normal = normal,
            FalseAlarm = falseAlarm,
            Anomalies = anomalies,
            Filter = filter,
            SamplePeriodSeconds = period,
            TargetAlarmsPerDay = target,
            Episodes = episodes,
            EpisodeNames = episodes is null ? null : episodePaths.Select(EnergyLog.DisplayName).ToList(),
        };
        var outcome = Calibrator.Calibrate(model, Path.GetFileName(modelPath), request,
            EnergyLog.DisplayName(normalPath), normalSha,
            anomaliesPath is null ? null : EnergyLog.DisplayName(anomaliesPath));
        var (report, calibrated) = (outcome.Report, outcome.Model);

        if (output is not null)
        {
            if (modelToStdout) ctx.Out.Write(ModelJson.ToText(calibrated));
            else ModelJson.WriteFile(calibrated, output.FullName, force);
        }
        if (parse.GetValue(_report) is { } reportFile)
        {
            var text = new StringWriter { NewLine = "\n" };
            JsonOut.Write(text, outcome.WriteJson);
            AtomicFile.WriteAllText(reportFile.FullName, text.ToString(), force);
        }
        if (parse.GetValue(_plot) is { } plot)
            CalibrationPlot.Write(report, outcome.Source.ModelName, plot.FullName, force);
        if (modelToStdout) return CliApp.Ok;
        if (parse.GetValue(_json)) JsonOut.Write(ctx.Out, outcome.WriteJson);
        else outcome.WriteText(ctx.Out);
        return CliApp.Ok;
    }

    /// <summary>
    /// A number option read in the invariant culture (0.01 means one hundredth whatever the system's locale), or null.
    /// </summary>
    private static double? Number(string option, string? text)
    {
        if (text is null) return null;
        if (double.TryParse(text.Trim(), NumberStyles.Float, CultureInfo.InvariantCulture, out double x)
            && double.IsFinite(x)) return x;
        throw new EmitException($"{option}: \"{text}\" is not a number", "write it with a decimal point, like 0.01");
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
}
