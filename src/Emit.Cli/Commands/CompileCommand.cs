using System.CommandLine;
using Emit.Emission;
using Emit.Quantize;
using Emit.Model;

namespace Emit.Cli.Commands;

/// <summary><c>emit compile MODEL</c>: writes C99 and/or C# free-energy scorers for a model.</summary>
public sealed class CompileCommand : ICliCommand
{
    private readonly Argument<FileInfo[]> _model = new Argument<FileInfo[]>("MODEL")
    {
        Description = "Model file (.json or .npz); several models of the same units make a classifier (each with a " +
                      "stored log Z: emit logz MODEL --store)",
        Arity = new ArgumentArity(1, 64),
    }.MustExist();

    private readonly Option<string?> _priors = new("--priors")
    {
        HelpName = "P1,P2,...",
        Description = "With several models: prior weight of each, comma-separated, in model order (default: equal)",
    };

    private readonly Option<string[]> _target = CliOptions.ChoiceList(
        "--target", "Output languages, comma-separated", Targets.All.Select(t => t.Name).ToArray(), "c");

    private readonly Option<Chosen<NumericMode>> _numeric = CliOptions.Choice(
        "--numeric", "Arithmetic of the generated scorer: f32, f64 or fixed (integer only, with a proved error bound)",
        NumericChoices.All, "f32");

    private readonly Option<string?> _name = new("--name")
    {
        Description = "Scorer name, a C identifier (default: from the model file name); files are NAME.h, NAME.c, " +
            "NAME.cs",
    };

    private readonly Option<string> _namespace = new("--namespace")
    {
        Description = "Namespace of the generated C# class",
        DefaultValueFactory = _ => CompileOptions.DefaultNamespace,
    };

    private readonly Option<string> _out = new("--out")
    {
        Description = "Output folder",
        HelpName = "DIR",
        DefaultValueFactory = _ => "out",
    };

    private readonly Option<DirectoryInfo> _templates = new Option<DirectoryInfo>("--templates")
    {
        Description = "Folder whose c/ and csharp/ sub-folders override shipped templates file by file",
        HelpName = "DIR",
    }.AcceptExistingOnly();

    private readonly Option<int> _selfTest = CliOptions.Number(
        "--selftest-vectors", $"Number of inputs embedded for the self-test (1 to {CompileOptions.MaxSelfTestVectors})",
        1, CompileOptions.MaxSelfTestVectors, CompileOptions.DefaultSelfTestVectors);

    private readonly FixedPointOptionSet _fixed = new();

    private readonly Option<OptimizeFor> _optimize = new("--optimize")
    {
        HelpName = "speed|size",
        Description = "Code layout: speed (rows added four at a time, vectorizable blocks) or size (plain loops, for " +
                      "flash-limited parts such as Cortex-M0); the results are bit-identical [default: speed]",
    };

    private readonly Option<bool> _stream = new("--stream")
    {
        Description = "Also emit streamed scoring (NAME_stream_reset/_flip/_free_energy: O(hidden) per " +
                      "flipped unit); kinds rbm and lateral",
    };

    private readonly Option<bool> _explain = new("--explain")
    {
        Description = "Also emit explanations (NAME_explain: the units whose flip lowers the free energy most); " +
                      "implies the streamed-scoring code; kinds rbm and lateral",
    };

    private readonly Option<string?> _alarmFilter = AlarmFilterOption.Create(
        "Also emit a K-of-N alarm filter over the decisions: on while K of the last N were unusual " +
        "(1 <= K <= N <= 32; needs a model threshold)");

    private readonly Option<bool> _force = CliOptions.Force();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("compile", "Generate free-energy scorers (C99 NAME.h + NAME.c, C# NAME.cs) from a model");
        cmd.Arguments.Add(_model);
        foreach (var option in new Option[] { _target, _numeric, _name, _namespace, _out, _templates, _selfTest,
            _optimize, _stream, _explain, _alarmFilter, _priors })
            cmd.Options.Add(option);
        _fixed.AddTo(cmd);
        cmd.Options.Add(_force);
        cmd.SetAction(parse =>
        {
            var mode = parse.GetValue(_numeric)!.Value;
            if (mode != NumericMode.Fixed && _fixed.GivenOption(parse) is { } given)
                throw new EmitException($"{given} applies to --numeric fixed only",
                    "add --numeric fixed or leave the option out");
            var models = parse.GetValue(_model)!;
            var priors = ClassifyCommand.ParsePriors(parse.GetValue(_priors));
            if (models.Length == 1 && priors is not null)
                throw new EmitException("--priors applies to a classifier (several models)",
                    "give two or more models, or leave --priors out");
            if (models.Length > 1)
            {
                var options = new CompileOptions(
                    parse.GetValue(_target)!, mode,
                    parse.GetValue(_name) ?? Naming.ScorerNameFromFile(models[0].FullName),
                    parse.GetValue(_namespace)!, parse.GetValue(_selfTest), parse.GetValue(_templates)?.FullName,
                    mode == NumericMode.Fixed ? _fixed.Read(parse) : null, parse.GetValue(_optimize),
                    parse.GetValue(_stream), parse.GetValue(_explain), AlarmFilterOption.Read(parse, _alarmFilter));
                return RunClassifier(ctx, models.Select(m => m.FullName).ToArray(), priors, options,
                    parse.GetValue(_out)!, parse.GetValue(_force), parse.GetValue(_name) is not null);
            }
            return Run(ctx,
                models[0].FullName,
                parse.GetValue(_target)!,
                mode,
                parse.GetValue(_name),
                parse.GetValue(_namespace)!,
                parse.GetValue(_out)!,
                parse.GetValue(_templates)?.FullName,
                parse.GetValue(_selfTest),
                mode == NumericMode.Fixed ? _fixed.Read(parse) : null,
                parse.GetValue(_optimize),
                AlarmFilterOption.Read(parse, _alarmFilter),
                parse.GetValue(_force),
                parse.GetValue(_stream),
                parse.GetValue(_explain));
        });
        return cmd;
    }

    private static int RunClassifier(CliContext ctx, string[] modelPaths, double[]? priors, CompileOptions options,
        string outDir, bool force, bool named)
    {
        if (!named)
            throw new EmitException("a classifier needs a name",
                "give --name NAME (files NAME.h, NAME.c, NAME.cs and NAME_1 ... per model)");
        var models = modelPaths.Select(ModelLoader.Load).ToArray();
        var labels = modelPaths.Select(p => Path.GetFileName(p)).ToArray();
        var compiled = ClassifierCompiler.Build(models, labels, priors, options);
        foreach (var path in OutputFolder.Write(outDir, compiled.AllFiles, force))
            ctx.Out.WriteLine($"wrote {path}");
        return CliApp.Ok;
    }

    private static int Run(CliContext ctx, string modelPath, string[] targets, NumericMode mode, string? name,
        string ns,
        string outDir, string? templates, int selfTest, Emit.Quantize.FixedPointOptions? fixedOptions,
        OptimizeFor optimize, Emit.Detection.AlarmFilterSpec? filter, bool force, bool stream, bool explain)
    {
        name ??= Naming.ScorerNameFromFile(modelPath);
        var options = new CompileOptions(targets, mode, name, ns, selfTest, templates, fixedOptions, optimize, stream,
            explain, filter);
        Naming.CheckScorerName(name);
        var model = ModelLoader.Load(modelPath);
        CompiledScorer compiled;
        try
        {
            compiled = ScorerCompiler.Build(model, Path.GetFileName(modelPath), options);
        }
        catch (EmitException e) when (e.File is null)
        {
            // A value of the model the scorer cannot hold: the model file is where to look.
            throw e.InFile(modelPath);
        }
        foreach (var path in OutputFolder.Write(outDir, compiled, force))
            ctx.Out.WriteLine($"wrote {path}");
        return CliApp.Ok;
    }
}
