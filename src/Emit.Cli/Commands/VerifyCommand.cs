using System.CommandLine;
using System.Globalization;
using Emit.Emission;
using Emit.Quantize;
using Emit.Harness;
using Emit.Model;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit verify MODEL --input DATA</c>: builds the generated scorer on each target (or checks existing sources with
/// <c>--generated DIR</c>), runs it over the vectors and compares every result with the reference scorer. Exit 0 when
/// every target passes, 1 when one fails, 2 for bad input or a missing toolchain.
/// </summary>
public sealed class VerifyCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model = new Argument<FileInfo>("MODEL") { Description = "Model file (.json or .npz)" }.AcceptExistingOnly();
    private readonly Option<string> _input = new("--input", "-i") { Description = "Vector file (CSV of 0/1, one vector per line), or - for standard input", Required = true };

    private readonly Option<string> _target = new("--target")
    {
        Description = $"Where to run the generated code, comma-separated: {Runners.NameList}",
        DefaultValueFactory = _ => "c",
    };

    private readonly Option<string?> _numeric = new("--numeric") { Description = "f64, f32 or fixed (default: as stamped in --generated sources, else f32)" };
    private readonly FixedPointOptionSet _fixed = new();
    private readonly Option<DirectoryInfo> _generated = new Option<DirectoryInfo>("--generated") { Description = "Check the sources emit compile wrote to this folder instead of generating them" }.AcceptExistingOnly();
    private readonly Option<string?> _name = new("--name") { Description = "Scorer name (default: the one scorer in --generated, else from the model file name)" };
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<FileInfo?> _report = new("--report") { Description = "Write the JSON report here (see docs/verify-report.md)" };
    private readonly Option<FileInfo?> _junit = new("--junit") { Description = "Write a JUnit XML report here, one testcase per target" };
    private readonly Option<FileInfo?> _plot = new("--plot") { Description = "Write a PNG histogram of the errors per target here" };
    private readonly Option<string?> _cc = new("--cc") { Description = "Host C compiler for target c (default: $CC, else cc)" };
    private readonly Option<string> _cflags = new("--cflags") { Description = "Extra flags for the host C compile, after the strict ones", DefaultValueFactory = _ => "" };
    private readonly Option<int> _timeout = new("--timeout") { Description = "Seconds allowed for each build and each run of generated code", DefaultValueFactory = _ => (int)RunnerSettings.DefaultTimeout.TotalSeconds };
    private readonly Option<DirectoryInfo?> _work = new("--work") { Description = "Build in this folder and keep it (default: a temporary folder, deleted)" };

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("verify", "Run the generated scorer on host C, .NET and an emulated Cortex-M3 and compare it with the reference scorer");
        cmd.Arguments.Add(_model);
        foreach (var option in new Option[] { _input, _target, _numeric, _generated, _name, _report, _junit, _plot, _force, _cc, _cflags, _timeout, _work })
            cmd.Options.Add(option);
        _fixed.AddTo(cmd);
        cmd.SetAction(parse => Run(ctx, parse));
        return cmd;
    }

    private int Run(CliContext ctx, ParseResult parse)
    {
        var modelPath = parse.GetRequiredValue(_model).FullName;
        NumericMode? mode = null;
        if (parse.GetValue(_numeric) is { } numeric)
            mode = NumericModeNames.Parse(numeric) ?? throw new EmitException($"--numeric {Naming.CommentText(numeric)} is unknown", "use f64, f32 or fixed");
        bool fixedGiven = new Option[] { _fixed.Weights, _fixed.Accumulator, _fixed.SoftplusTable }.Any(o => parse.GetResult(o) is { Implicit: false });
        int timeout = parse.GetValue(_timeout);
        if (timeout < 1) throw new EmitException($"--timeout {timeout} is not allowed", "give a number of seconds, at least 1");
        var model = ModelLoader.Load(modelPath);
        var request = new VerifyRequest
        {
            Model = model,
            ModelLabel = Path.GetFileName(modelPath),
            InputPath = parse.GetRequiredValue(_input),
            Stdin = ctx.In,
            Targets = parse.GetValue(_target)!.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries),
            Numeric = mode,
            Fixed = fixedGiven || mode == NumericMode.Fixed && parse.GetValue(_generated) is null ? _fixed.Read(parse) : null,
            GeneratedDirectory = parse.GetValue(_generated)?.FullName,
            Name = parse.GetValue(_name),
            Settings = new RunnerSettings(parse.GetValue(_cc), parse.GetValue(_cflags) ?? "", TimeSpan.FromSeconds(timeout)),
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
