using System.CommandLine;
using System.Diagnostics;
using System.Globalization;
using Emit.Model;
using Emit.Training;
using Spectre.Console;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit train --data DATA --hidden N -o MODEL.json [options]</c>: trains a model on logs of normal operation
/// (docs/train.md). Progress per epoch on standard output (a bar on a terminal, plain lines otherwise; standard
/// error when the model itself goes to standard output); Ctrl-C stops before the next batch, writes nothing and
/// exits with <see cref="Interrupted"/>.
/// </summary>
public sealed class TrainCommand : ICliCommand
{
    /// <summary>
    /// Exit code after Ctrl-C: 128 + SIGINT (2), as shells report a process ended by SIGINT (common practice).
    /// </summary>
    public const int Interrupted = 130;

    private static readonly TrainerSettings Defaults = new();

    private readonly Option<string> _data = new("--data")
    {
        HelpName = "DATA",
        Description = "Training rows: a vector file of 0/1 (CSV, unit names in an optional header row), or - for " +
            "standard input",
        Required = true,
    };
    private readonly Option<int> _hidden = new("--hidden")
    {
        HelpName = "N",
        Description = "Hidden units",
        Required = true,
    };
    private readonly Option<ModelKind?> _kind = new("--kind")
    {
        Description = "Couplings: rbm (visible-hidden only), lateral (plus visible-visible), general (plus " +
            "hidden-hidden; at most 16 hidden) [default: rbm]",
        CustomParser = r => Choice(r, ModelKindNames.Parse(r.Tokens[^1].Value), "--kind", "rbm, lateral or general"),
        HelpName = "rbm|lateral|general",
    };
    private readonly Option<TrainingMethod?> _method = new("--method")
    {
        Description = "Negative phase: cd (chains start at the batch's rows) or pcd (persistent chains) [default: pcd]",
        CustomParser = r =>
        Choice(r,
            r.Tokens[^1].Value switch { "cd" => TrainingMethod.Cd, "pcd" => TrainingMethod.Pcd,
                _ => (TrainingMethod?)null }, "--method", "cd or pcd"),
        HelpName = "cd|pcd",
    };
    private readonly Option<int> _gibbs = new("--gibbs-steps")
    {
        HelpName = "K",
        Description = "Gibbs steps per update (the k of CD-k)",
        DefaultValueFactory = _ => Defaults.GibbsSteps,
    };
    private readonly Option<int> _epochs = new("--epochs")
    {
        HelpName = "E",
        Description = "Passes over the training rows (at most, with early stopping)",
        DefaultValueFactory = _ => Defaults.Epochs,
    };
    private readonly Option<int> _batch = new("--batch")
    {
        HelpName = "B",
        Description = "Rows per update (also the number of persistent chains)",
        DefaultValueFactory = _ => Defaults.BatchSize,
    };
    private readonly Option<double> _rate = CliOptions.Real("--learning-rate",
        "Initial learning rate; it decays linearly to zero over the second half of the epochs", Defaults.LearningRate);
    private readonly Option<double> _momentum = CliOptions.Real("--momentum",
        "Momentum (after the first 5 epochs, which use 0.5)", Defaults.Momentum);
    private readonly Option<double> _decay = CliOptions.Real("--weight-decay", "L2 weight decay on the couplings",
        Defaults.WeightDecay);
    private readonly Option<string?> _validation = new("--validation")
    {
        HelpName = "DATA",
        Description = "Held-out rows of normal operation: scored each epoch; the best epoch's model is written",
    };
    private readonly Option<int> _patience = new("--patience")
    {
        HelpName = "P",
        Description = "With --validation: stop after this many epochs without improvement (0: never)",
        DefaultValueFactory = _ => Defaults.Patience,
    };
    private readonly Option<ulong> _seed = new("--seed")
    {
        HelpName = "S",
        Description = "Random seed (same data, options and seed give the same model bytes)",
        DefaultValueFactory = _ => Defaults.Seed,
    };
    private readonly Option<int> _threads = new("--threads")
    {
        Description = "Worker threads (the model does not depend on it) [default: the number of cores]",
        HelpName = "N",
    };
    private readonly Option<string> _output = new("--output", "-o")
    {
        HelpName = "FILE",
        Description = "Model file to write (JSON), or - for standard output",
        Required = true,
    };
    private readonly Option<bool> _force = CliOptions.Force();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("train",
            "Train a model on logs of normal operation (binary vectors) and write it as a model file")
        {
            _data, _hidden, _kind, _method, _gibbs, _epochs, _batch, _rate, _momentum, _decay, _validation, _patience,
                _seed, _threads, _output, _force,
        };
        cmd.SetAction(parse => Run(ctx, parse));
        return cmd;
    }

    private int Run(CliContext ctx, ParseResult parse)
    {
        var settings = new TrainerSettings
        {
            Kind = parse.GetValue(_kind) ?? Defaults.Kind,
            Hidden = parse.GetValue(_hidden),
            Method = parse.GetValue(_method) ?? Defaults.Method,
            GibbsSteps = parse.GetValue(_gibbs),
            Epochs = parse.GetValue(_epochs),
            BatchSize = parse.GetValue(_batch),
            LearningRate = parse.GetValue(_rate),
            Momentum = parse.GetValue(_momentum),
            WeightDecay = parse.GetValue(_decay),
            Patience = parse.GetValue(_patience),
            Seed = parse.GetValue(_seed),
            Threads = parse.GetResult(_threads) is null ? Environment.ProcessorCount : parse.GetValue(_threads),
        };
        foreach (var (setting, problem) in settings.Problems())
            throw new EmitException($"--{setting} {problem}");
        var output = parse.GetRequiredValue(_output);
        bool force = parse.GetValue(_force);
        bool toStdout = output == "-";
        if (!toStdout) AtomicFile.Precheck(output, force);

        var data = TrainingData.Load(parse.GetRequiredValue(_data), null, ctx.In);
        var validation = parse.GetValue(_validation) is { } vpath ? TrainingData.Load(vpath, data.Width, ctx.In) : null;
        if (validation is not null && !data.Names.IsEmpty && !validation.Names.IsEmpty
            && !data.Names.SequenceEqual(validation.Names))
            throw new EmitException("the validation file's header names other units than the training file's",
                "put the columns in the same order", validation.Source);
        if (data.Rows < settings.BatchSize)
            throw new EmitException($"{data.Rows} rows, fewer than --batch {settings.BatchSize}",
                "give more rows or a smaller --batch", data.Source);

        var log = toStdout ? ctx.Error : ctx.Out;
        bool bar = ReferenceEquals(log, Console.Out) && !Console.IsOutputRedirected
                   || ReferenceEquals(log, Console.Error) && !Console.IsErrorRedirected;
        log.WriteLine($"emit train: {data.Rows} rows × {data.Width} units from {data.Source}" +
                      (validation is null ? "" : $", {validation.Rows} validation rows from {validation.Source}") +
                      $"; kind {settings.Kind.ToText()}, {settings.Hidden} hidden, " +
                      $"{(settings.Method == TrainingMethod.Pcd ? "pcd" : "cd")}-{settings.GibbsSteps}, " +
                      $"{settings.Epochs} epochs, {settings.Threads} thread(s)");

        using var cts = new CancellationTokenSource();
        ConsoleCancelEventHandler onCancel = (_, e) => { e.Cancel = true; cts.Cancel(); };
        Console.CancelKeyPress += onCancel;
        var sw = Stopwatch.StartNew();
        TrainingResult result;
        int lastEpoch = 0;
        try
        {
            result = bar
                ? WithBar(log, data, validation, settings, e => lastEpoch = e, cts.Token)
                : Trainer.Train(data, settings, validation, r => { lastEpoch = r.Epoch; log.WriteLine(Line(r)); },
                    cts.Token);
        }
        catch (OperationCanceledException) when (cts.IsCancellationRequested)
        {
            ctx.Error.WriteLine($"emit: training interrupted during epoch {lastEpoch + 1}; nothing written");
            return Interrupted;
        }
        finally
        {
            Console.CancelKeyPress -= onCancel;
        }
        if (!result.ConstantUnits.IsEmpty)
        {
            var names = result.ConstantUnits.Select(i => data.Names.IsEmpty ? "unit " + i : data.Names[i]);
            log.WriteLine(
                $"note: {result.ConstantUnits.Length} unit(s) constant in the training rows, visible bias clipped at " +
                $"log-odds ±{-TrainingMath.Log(0.001 / 0.999):F2}: {string.Join(", ", names)}");
        }
        var trained = result.Model;
        var model = new BoltzmannModel(trained.Kind, trained.Visible, trained.Hidden, trained.VisibleBias,
            trained.HiddenBias, trained.Weights,
            trained.VisibleLinks, trained.HiddenLinks, trained.Names,
            metadataJson: TrainingMetadata.Json(data, validation, settings, result));
        if (toStdout) ctx.Out.Write(ModelJson.ToText(model));
        else ModelJson.WriteFile(model, output, force);
        var kept = result.Kept;
        log.WriteLine(
            $"emit train: {result.Epochs.Length} epoch(s) in " +
            $"{sw.Elapsed.TotalSeconds.ToString("F3", CultureInfo.InvariantCulture)} s" +
                      (result.StoppedEarly ? " (stopped early)" : "") +
                      (validation is not null ? $", kept epoch {result.EpochKept}" : "") +
                      (kept?.ValidationLogLikelihood is { } ll ? $" (validation log-likelihood {F(ll)} nats per row)"
                          : "") +
                      $"; wrote {(toStdout ? "standard output" : output)}");
        return CliApp.Ok;
    }

    /// <summary>A typed choice, or a one-line parse error naming the option and its allowed values.</summary>
    private static T? Choice<T>(System.CommandLine.Parsing.ArgumentResult r, T? value, string option,
        string allowed) where T : struct
    {
        if (value is { } v) return v;
        r.AddError($"{option}: \"{r.Tokens[^1].Value}\" is not one of {allowed}");
        return null;
    }

    private static string F(double x) => x.ToString("F4", CultureInfo.InvariantCulture);

    /// <summary>One plain progress line per epoch.</summary>
    internal static string Line(EpochReport r)
    {
        var s = $"epoch {r.Epoch}/{r.Epochs}  rate {r.LearningRate.ToString("G4", CultureInfo.InvariantCulture)}  " +
            $"reconstruction {F(r.ReconstructionError)}";
        if (r.FreeEnergyGap is { } gap) s += $"  free-energy gap {F(gap)}";
        if (r.ValidationLogLikelihood is { } ll) s += $"  validation log p(v) {F(ll)}";
        if (r.ValidationPseudoLogLikelihood is { } pll) s += $"  validation pseudo-log-likelihood {F(pll)}";
        if (r.Best) s += "  *";
        return s;
    }

    private static TrainingResult WithBar(TextWriter log, TrainingData data, TrainingData? validation,
        TrainerSettings settings, Action<int> epochDone, CancellationToken cancel)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(log) });
        TrainingResult? result = null;
        console.Progress().AutoClear(false).HideCompleted(false).Start(p =>
        {
            var task = p.AddTask("training", maxValue: Math.Max(1, settings.Epochs));
            result = Trainer.Train(data, settings, validation, r =>
            {
                epochDone(r.Epoch);
                task.Value = r.Epoch;
                task.Description = Markup.Escape(Line(r));
            }, cancel);
        });
        return result!;
    }
}
