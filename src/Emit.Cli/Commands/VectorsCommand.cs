using System.CommandLine;
using System.Text;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary><c>emit vectors MODEL --count N --out FILE.csv [--seed S] [--from DATA]</c>: deterministic test vectors.</summary>
public sealed class VectorsCommand : ICliCommand
{
    /// <summary>Most rows of DATA kept in memory to draw from.</summary>
    public const int MaxDataRows = 100_000;

    private readonly Argument<FileInfo> _model = new("MODEL") { Description = "Model file (.json or .npz)" };
    private readonly Option<int> _count = new("--count", "-n") { Description = "Number of vectors", Required = true };
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<FileInfo> _out = new("--out", "-o") { Description = "CSV file to write", Required = true };
    private readonly Option<ulong> _seed = new("--seed") { Description = "Random seed (same seed, same file)", DefaultValueFactory = _ => 1UL };
    private readonly Option<string?> _from = new("--from") { Description = "Vector file to draw some rows from (its first 100000 rows)" };
    private readonly Option<int> _burnIn = new("--burn-in") { Description = "Gibbs sweeps discarded before sampling", DefaultValueFactory = _ => 1000 };

    public Command Build(CliContext ctx)
    {
        _model.AcceptExistingOnly();
        _count.Validators.Add(r => { if (r.GetValueOrDefault<int>() < 1) r.AddError("--count must be at least 1"); });
        var cmd = new Command("vectors",
            "Generate test vectors: all-off, all-on, each hidden unit's input maximiser and minimiser, pairs across the threshold, Gibbs samples from the model, rows of DATA")
        {
            _model, _count, _out, _seed, _from, _burnIn, _force,
        };
        cmd.SetAction(parse =>
        {
            var model = ModelLoader.Load(parse.GetRequiredValue(_model).FullName);
            List<byte[]>? data = null;
            if (parse.GetValue(_from) is { } from)
            {
                using var reader = VectorReader.Open(from, model.Visible, ctx.In);
                data = new List<byte[]>();
                var row = new byte[model.Visible];
                while (data.Count < MaxDataRows && reader.TryRead(row)) data.Add(row.ToArray());
            }
            var set = TestVectorSet.Generate(model, new TestVectorOptions(parse.GetValue(_count), parse.GetValue(_seed), parse.GetValue(_burnIn)), data);
            var path = parse.GetRequiredValue(_out).FullName;
            AtomicFile.Write(path, parse.GetValue(_force), stream =>
            {
                using var w = new StreamWriter(stream, new UTF8Encoding(false));
                var vw = new VectorWriter(w, model.Names);
                foreach (var v in set) vw.Write(v.Units);
            });
            ctx.Out.WriteLine($"wrote {set.Count} vectors to {path}: " +
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
