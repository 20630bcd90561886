using System.CommandLine;
using System.Globalization;
using Emit.Model;
using Emit.Reference;
using Spectre.Console;

namespace Emit.Cli.Commands;

/// <summary><c>emit logz MODEL --method exact [--json] [--store]</c>: the log partition function.</summary>
public sealed class LogzCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "Model file (.json or .npz)" }.MustExist();
    private readonly Option<Chosen<LogZMethod>> _method = CliOptions.Choice(
        "--method",
        "How to compute log Z: exact (enumeration) or ais (annealed importance sampling, for larger models)",
        [("exact", LogZMethod.Exact), ("ais", LogZMethod.Ais)], "exact");
    private readonly Option<int> _chains = CliOptions.Number("--chains", "AIS: independent chains", 1, int.MaxValue,
        new AisOptions().Chains);
    private readonly Option<int> _steps = CliOptions.Number("--steps",
        "AIS: annealing steps from the base model to the model", 1, int.MaxValue, new AisOptions().Steps);
    private readonly Option<ulong> _seed = CliOptions.Number("--seed", "AIS: random seed (same seed, same result)",
        ulong.MinValue, ulong.MaxValue, new AisOptions().Seed);
    private readonly Option<bool> _json =
        new("--json") { Description = "Write the result as JSON to standard output instead of text" };
    private readonly Option<bool> _store = new("--store")
    {
        Description = "Also write the result into MODEL's log_partition, replacing MODEL (JSON models only)",
    };

    /// <summary>Above this many states a progress bar is shown on stderr.</summary>
    public const long ProgressStates = 1L << 20;

    /// <summary>Above this many states a time estimate is printed before starting.</summary>
    public const long EstimateStates = 1L << 26;

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("logz", "Compute the log partition function log Z of a model, exactly or by sampling")
        {
            _model, _method, _chains, _steps, _seed, _json, _store,
        };
        cmd.SetAction(parse =>
        {
            var path = parse.GetRequiredValue(_model).FullName;
            var model = ModelLoader.Load(path);
            bool store = parse.GetValue(_store);
            if (store && path.EndsWith(".npz", StringComparison.OrdinalIgnoreCase))
                throw new EmitException("--store needs a JSON model", "run emit import first", path);
            var (logZ, stderr, method, states, seconds, detail) = parse.GetValue(_method)!.Value == LogZMethod.Ais
                ? Ais(model, new AisOptions(parse.GetValue(_chains), parse.GetValue(_steps), parse.GetValue(_seed)))
                : Exact(ctx, model);
            if (store)
            {
                ModelJson.WriteFile(model.With(model.Threshold, new LogPartition(logZ, method, stderr)), path,
                    force: true);
                ctx.Error.WriteLine($"emit: stored log_partition in {path}");
            }
            if (parse.GetValue(_json))
            {
                JsonOut.Write(ctx.Out, w =>
                {
                    w.WriteStartObject();
                    w.WriteNumber("log_partition", logZ);
                    w.WriteString("method", method);
                    w.WriteNumber("states", states);
                    w.WriteNumber("seconds", Math.Round(seconds, 3));
                    if (method == "ais") w.WriteNumber("stderr", stderr);
                    w.WriteEndObject();
                });
            }
            else
            {
                ctx.Out.WriteLine($"log Z = {logZ.ToString("R", CultureInfo.InvariantCulture)}" +
                                  (method == "ais" ? $" ± {stderr.ToString("G3", CultureInfo.InvariantCulture)}" : "") +
                                  $"  ({method}, {detail}, {seconds:F3} s)");
            }
            return CliApp.Ok;
        });
        return cmd;
    }

    private static (double, double, string, long, double, string) Exact(CliContext ctx, BoltzmannModel model)
    {
        long states = ExactLogPartition.States(model);
        if (states > EstimateStates)
            ctx.Error.WriteLine(
                $"emit: exact log Z visits {states} states; estimated {ExactLogPartition.EstimateSeconds(model):F0} " +
                $"s on {Environment.ProcessorCount} cores");
        var r = states > ProgressStates && ctx.ErrorIsConsole && !Console.IsErrorRedirected
            ? WithProgressBar(model, states)
            : ExactLogPartition.Compute(model);
        return (r.LogPartition, 0.0, "exact", r.States, r.Seconds, r.Enumerated);
    }

    private static (double, double, string, long, double, string) Ais(BoltzmannModel model, AisOptions options)
    {
        var r = AisLogPartition.Estimate(model, options);
        // "states" for AIS: the chain states visited (chains × steps).
        return (r.LogPartition, r.Stderr, "ais", (long)r.Chains * r.Steps, r.Seconds,
            $"{r.Chains} chains × {r.Steps} steps");
    }

    private static LogPartitionResult WithProgressBar(BoltzmannModel model, long states)
    {
        var console = AnsiConsole.Create(new AnsiConsoleSettings { Out = new AnsiConsoleOutput(Console.Error) });
        LogPartitionResult? result = null;
        console.Progress().AutoClear(true).Start(p =>
        {
            var task = p.AddTask("log Z states", maxValue: states);
            result = ExactLogPartition.Compute(model, new SyncProgress(task));
        });
        return result!;
    }

    /// <summary>Reports straight from worker threads (Spectre's task value is thread-safe).</summary>
    private sealed class SyncProgress(ProgressTask task) : IProgress<long>
    {
        public void Report(long value)
        {
            lock (task) { if (value > task.Value) task.Value = value; }
        }
    }
}
