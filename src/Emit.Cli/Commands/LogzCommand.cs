using System.CommandLine;
using System.Globalization;
using Emit.Model;
using Emit.Reference;
using Spectre.Console;

namespace Emit.Cli.Commands;

/// <summary><c>emit logz MODEL --method exact [--json] [--store]</c>: the log partition function.</summary>
public sealed class LogzCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model = new("MODEL") { Description = "Model file (.json or .npz)" };
    private readonly Option<string> _method = new("--method")
    {
        Description = "How to compute log Z: exact (enumeration)",
        DefaultValueFactory = _ => "exact",
    };
    private readonly Option<bool> _json = new("--json") { Description = "Write the result as JSON" };
    private readonly Option<bool> _store = new("--store") { Description = "Write the result into the model file's log_partition (JSON models only)" };

    /// <summary>Above this many states a progress bar is shown on stderr.</summary>
    public const long ProgressStates = 1L << 20;

    /// <summary>Above this many states a time estimate is printed before starting.</summary>
    public const long EstimateStates = 1L << 26;

    public Command Build(CliContext ctx)
    {
        _model.AcceptExistingOnly();
        _method.AcceptOnlyFromAmong("exact");
        var cmd = new Command("logz", "Compute the log partition function log Z of a model by exact enumeration")
        {
            _model, _method, _json, _store,
        };
        cmd.SetAction(parse =>
        {
            var path = parse.GetRequiredValue(_model).FullName;
            var model = ModelLoader.Load(path);
            bool store = parse.GetValue(_store);
            if (store && path.EndsWith(".npz", StringComparison.OrdinalIgnoreCase))
                throw new EmitException("--store needs a JSON model", "run emit import first", path);
            long states = ExactLogPartition.States(model);
            if (states > EstimateStates)
                ctx.Error.WriteLine($"emit: exact log Z visits {states} states; estimated {ExactLogPartition.EstimateSeconds(model):F0} s on {Environment.ProcessorCount} cores");
            var result = states > ProgressStates && ReferenceEquals(ctx.Error, Console.Error) && !Console.IsErrorRedirected
                ? WithProgressBar(model, states)
                : ExactLogPartition.Compute(model);
            if (store)
            {
                ModelJson.WriteFile(model.With(model.Threshold, new LogPartition(result.LogPartition, "exact", 0.0)), path);
                ctx.Error.WriteLine($"emit: stored log_partition in {path}");
            }
            if (parse.GetValue(_json))
            {
                JsonOut.Write(ctx.Out, w =>
                {
                    w.WriteStartObject();
                    w.WriteNumber("log_partition", result.LogPartition);
                    w.WriteString("method", "exact");
                    w.WriteNumber("states", result.States);
                    w.WriteNumber("seconds", Math.Round(result.Seconds, 3));
                    w.WriteEndObject();
                });
            }
            else
            {
                ctx.Out.WriteLine($"log Z = {result.LogPartition.ToString("R", CultureInfo.InvariantCulture)}  (exact, {result.Enumerated}, {result.Seconds:F3} s)");
            }
            return CliApp.Ok;
        });
        return cmd;
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
