using System.CommandLine;
using System.Text;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit vectors MODEL --count N -o FILE.csv [--seed S] [--from DATA]</c>: deterministic test vectors.
/// </summary>
public sealed class VectorsCommand : ICliCommand
{
    /// <summary>Most rows of DATA kept in memory to draw from.</summary>
    public const int MaxDataRows = 100_000;

    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "Model file (.json or .npz)" }.MustExist();
    private readonly Option<int> _count = CliOptions.Number("--count", "Number of vectors", 1, MaxCount,
        aliases: ["-n"]);
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly (Option<string> Output, Option<string> Former) _output = CliOptions.Output(
        "CSV file to write, or - for standard output");
    private readonly Option<ulong> _seed = CliOptions.Number("--seed", "Random seed (same seed, same file)",
        ulong.MinValue, ulong.MaxValue, 1UL);
    private readonly Option<string?> _from = new("--from")
    {
        Description = "Vector file to draw some rows from (its first 100000 rows), or - for standard input",
        HelpName = "DATA",
    };
    private readonly Option<int> _burnIn = CliOptions.Number("--burn-in", "Gibbs sweeps discarded before sampling", 0,
        int.MaxValue, 1000);

    /// <summary>Most vectors one run writes.</summary>
    public const int MaxCount = 100_000_000;

    public Command Build(CliContext ctx)
    {
        _count.Required = true;
        var cmd = new Command("vectors",
            "Generate test vectors: all-off, all-on, each hidden unit's input maximiser and minimiser, pairs across " +
            "the threshold, Gibbs samples from the model, rows of DATA")
        {
            _model, _count, _output.Output, _output.Former, _seed, _from, _burnIn, _force,
        };
        cmd.SetAction(parse =>
        {
            var modelPath = parse.GetRequiredValue(_model).FullName;
            var path = CliOptions.ReadOutput(parse, _output, ctx.Error)
                       ?? throw new EmitException("no output file given",
                           "name one with -o/--output FILE, or - for standard output");
            AtomicFile.RefuseInput(path, modelPath, parse.GetValue(_from));
            var model = ModelLoader.Load(modelPath);
            List<byte[]>? data = null;
            if (parse.GetValue(_from) is { } from)
            {
                using var reader = VectorReader.Open(from, model.Visible, ctx.In);
                data = new List<byte[]>();
                var row = new byte[model.Visible];
                while (data.Count < MaxDataRows && reader.TryRead(row)) data.Add(row.ToArray());
            }
            var set = TestVectorSet.Generate(model,
                new TestVectorOptions(parse.GetValue(_count), parse.GetValue(_seed), parse.GetValue(_burnIn)), data);
            TextOutput.Write(path, parse.GetValue(_force), ctx.Out, w =>
            {
                var vw = new VectorWriter(w, model.Names);
                foreach (var v in set) vw.Write(v.Units);
            });
            // With the vectors on standard output, the summary goes to standard error.
            (TextOutput.IsStdout(path) ? ctx.Error : ctx.Out).WriteLine(
                $"wrote {set.Count} vectors to " +
                $"{(TextOutput.IsStdout(path) ? "standard output" : Path.GetFullPath(path))}: " +
                string.Join(", ", set.GroupBy(v => v.Origin).Select(g => $"{g.Count()} {Describe(g.Key)}")));
            return CliApp.Ok;
        });
        return cmd;
    }

    private static string Describe(VectorOrigin o) => o switch
    {
        VectorOrigin.AllOff => "all-off",
        VectorOrigin.AllOn => "all-on",
        VectorOrigin.UnitMaximiser => "unit maximisers",
        VectorOrigin.UnitMinimiser => "unit minimisers",
        VectorOrigin.NearThreshold => "near the threshold",
        VectorOrigin.Sample => "Gibbs samples",
        VectorOrigin.Data => "from data",
        _ => o.ToString(),
    };
}
