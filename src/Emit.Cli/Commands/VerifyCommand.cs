using System.CommandLine;
using System.Globalization;
using Emit.Emission;
using Emit.Quantize;
using Emit.Harness;
using Emit.Model;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit verify MODEL --input DATA</c>: builds the generated scorer on each target (or checks existing sources with
/// <c>--generated DIR</c>: first that they are exactly what emit generates from the model with the options and
/// templates their manifest records), runs it over the vectors and compares every result with the reference scorer.
/// Exit 0 when every target passes, 1 when one fails, 2 for bad input or a missing toolchain.
/// </summary>
public sealed class VerifyCommand : ICliCommand
{
    private readonly Argument<FileInfo[]> _model = new Argument<FileInfo[]>("MODEL")
    {
        Description = "Model file (.json or .npz); several models: generate and check the classifier over them, " +
            "as compile does (with --generated: the classifier compiled from them, in the same order)",
        Arity = new ArgumentArity(1, 64),
    }.MustExist();
    private readonly Option<string?> _priors = new("--priors")
    {
        HelpName = "P1,P2,...",
        Description = "With several models: the classifier's prior weights, comma-separated, in model order " +
            "(default: equal)",
    };
    private readonly Option<string> _input = new("--input", "-i")
    {
        Description = "Vector file (CSV of 0/1, one vector per line), or - for standard input",
        Required = true,
    };

    private readonly Option<string[]> _target = CliOptions.ChoiceList(
        "--target", "Where to run the generated code, comma-separated", Runners.All.Select(r => r.Name).ToArray(), "c");

    private readonly Option<Chosen<NumericMode>> _numeric = CliOptions.Choice(
        "--numeric", "Arithmetic of the scorer to check (default: as stamped in --generated sources, else f32)",
        NumericChoices.All);
    private readonly FixedPointOptionSet _fixed = new();
    private readonly Option<DirectoryInfo> _generated = new Option<DirectoryInfo>("--generated")
    {
        Description = "Check the sources emit compile wrote to this folder instead of generating them",
        HelpName = "DIR",
    }.MustExist();
    private readonly Option<string?> _name = new("--name")
    {
        Description = "Scorer name, or with several models the classifier's (default: the one scorer or classifier " +
            "in --generated, else from the model file name)",
    };
    private readonly Option<bool> _allowModelChange = new("--allow-model-change")
    {
        Description = "With --generated: compare the numbers even when the sources were generated from another model " +
            "(otherwise exit 1 without running them)",
    };
    private readonly Option<bool> _failOnDecision = new("--fail-on-decision-mismatch")
    {
        Description = "Fail a target on any decision that differs from the reference, even one within the error bound",
    };
    private readonly Option<DirectoryInfo> _templates = new Option<DirectoryInfo>("--templates")
    {
        Description = "With --generated: the templates folder the sources were compiled with, when they used custom " +
            "templates",
        HelpName = "DIR",
    }.MustExist();
    private readonly Option<bool> _stream = new("--stream")
    {
        Description = "Without --generated: also emit streamed scoring and check walks of flips from each vector " +
            "(with --generated the manifest says)",
    };
    private readonly Option<bool> _explain = new("--explain")
    {
        Description = "Without --generated: also emit explanations and check them against the reference explainer",
    };
    private readonly Option<string?> _alarmFilter = AlarmFilterOption.Create(
        "Also emit and check the K-of-N alarm filter (default: as recorded in --generated sources' manifest, " +
        "else none)");
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<FileInfo?> _report = new("--report")
    {
        Description = "Also write the JSON report to this file (see docs/verify-report.md)",
        HelpName = "FILE",
    };
    private readonly Option<FileInfo?> _junit = new("--junit")
    {
        Description = "Also write a JUnit XML report to this file, one testcase per target",
        HelpName = "FILE",
    };
    private readonly Option<FileInfo?> _plot = new("--plot")
    {
        Description = "Also write a PNG histogram of the errors per target to this file",
        HelpName = "FILE",
    };
    private readonly Option<string?> _cc =
        new("--cc") { Description = "Host C compiler for target c (default: $CC, else cc)" };
    private readonly Option<string> _cflags = new("--cflags")
    {
        Description = "Extra flags for the host C compile, after the strict ones",
        DefaultValueFactory = _ => "",
    };
    private readonly Option<int> _timeout = CliOptions.Number("--timeout",
        "Seconds allowed for each build and each run of generated code", 1, 86400,
        (int)RunnerSettings.DefaultTimeout.TotalSeconds);
    private readonly Option<DirectoryInfo?> _work = new("--work")
    {
        Description = "Build in this folder and keep it (default: a temporary folder, deleted)",
        HelpName = "DIR",
    };

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("verify",
            "Run the generated scorer on host C, .NET and an emulated Cortex-M3 and compare it with the reference " +
            "scorer");
        cmd.Arguments.Add(_model);
        foreach (var option in new Option[] { _input, _target, _numeric, _generated, _name, _allowModelChange,
            _failOnDecision, _templates, _stream, _explain, _alarmFilter, _priors, _report, _junit, _plot, _force,
            _cc, _cflags, _timeout,
            _work })
            cmd.Options.Add(option);
        _fixed.AddTo(cmd);
        cmd.SetAction(parse => Run(ctx, parse));
        return cmd;
    }

    private int Run(CliContext ctx, ParseResult parse)
    {
        var modelFiles = parse.GetRequiredValue(_model);
        var modelPath = modelFiles[0].FullName;
        var priors = ClassifyCommand.ParsePriors(parse.GetValue(_priors));
        if (modelFiles.Length == 1 && priors is not null)
            throw new EmitException("--priors applies to a classifier (several models)",
                "give two or more models, or leave --priors out");
        bool force = parse.GetValue(_force);
        foreach (var output in new[] { parse.GetValue(_report), parse.GetValue(_junit), parse.GetValue(_plot) })
        {
            if (output is null) continue;
            AtomicFile.RefuseInput(output.FullName, modelPath, parse.GetRequiredValue(_input));
            AtomicFile.Precheck(output.FullName, force);
        }
        NumericMode? mode = parse.GetValue(_numeric)?.Value;
        bool fixedGiven = new Option[] { _fixed.Weights, _fixed.Accumulator, _fixed.SoftplusTable }.Any(
            o => parse.GetResult(o) is { Implicit: false });
        int timeout = parse.GetValue(_timeout);
        if (parse.GetValue(_generated) is null)
            foreach (var option in new Option[] { _allowModelChange, _templates })
                if (parse.GetResult(option) is { Implicit: false })
                    throw new EmitException($"{option.Name} applies to existing sources only",
                        "add --generated DIR, or leave the option out");
        var model = ModelLoader.Load(modelPath);
        var request = new VerifyRequest
        {
            Model = model,
            ModelLabel = Path.GetFileName(modelPath),
            InputPath = parse.GetRequiredValue(_input),
            Stdin = ctx.In,
            Targets = parse.GetValue(_target)!,
            Numeric = mode,
            Fixed = fixedGiven || mode == NumericMode.Fixed && parse.GetValue(_generated) is null ? _fixed.Read(parse)
            : null,
            GeneratedDirectory = parse.GetValue(_generated)?.FullName,
            AlarmFilter = AlarmFilterOption.Read(parse, _alarmFilter),
            MoreModels = modelFiles.Skip(1).Select(f => (ModelLoader.Load(f.FullName), f.Name)).ToArray(),
            Priors = priors,
            Name = parse.GetValue(_name),
            AllowModelChange = parse.GetValue(_allowModelChange),
            FailOnDecisionMismatch = parse.GetValue(_failOnDecision),
            Stream = parse.GetValue(_stream),
            Explain = parse.GetValue(_explain),
            TemplatesDirectory = parse.GetValue(_templates)?.FullName,
            Settings = new RunnerSettings(parse.GetValue(_cc), parse.GetValue(_cflags) ?? "",
                TimeSpan.FromSeconds(timeout)),
            WorkDirectory = parse.GetValue(_work)?.FullName,
        };
        var report = Verifier.Run(request);
        foreach (var w in report.Warnings) ctx.Error.WriteLine("emit: warning: " + w);
        ReportText.Write(report, ctx.Out);
        if (parse.GetValue(_report) is { } json)
        {
            AtomicFile.Write(json.FullName, parse.GetValue(_force), s =>
            {
                using var w = new System.Text.Json.Utf8JsonWriter(s, new System.Text.Json.JsonWriterOptions
                {
                    Indented = true,
                    NewLine = "\n",
                    Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
                });
                ReportJson.Write(report, w);
                w.Flush();
                s.WriteByte((byte)'\n');
            });
            ctx.Out.WriteLine($"wrote {json.FullName}");
        }
        if (parse.GetValue(_junit) is { } junit)
        {
            AtomicFile.Write(junit.FullName, parse.GetValue(_force), s => ReportJUnit.Write(report, s));
            ctx.Out.WriteLine($"wrote {junit.FullName}");
        }
        if (parse.GetValue(_plot) is { } plot)
        {
            ErrorPlot.Write(report, plot.FullName, parse.GetValue(_force));
            ctx.Out.WriteLine($"wrote {plot.FullName}");
        }
        return report.Passed ? CliApp.Ok : CliApp.CheckFailed;
    }
}
