using System.CommandLine;
using System.Text;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit score MODEL --input DATA [--output FILE]</c>: the reference free energy of every vector, streamed in
/// batches (constant memory), as CSV <c>index,free_energy[,log_probability][,unusual]</c>.
/// </summary>
public sealed class ScoreCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "Model file (.json or .npz)" }.MustExist();
    private readonly Option<string> _input = new("--input", "-i")
    {
        Description = "Vector file (CSV of 0/1, one vector per line), or - for standard input",
        Required = true,
        HelpName = "DATA",
    };
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<string?> _output = new("--output", "-o")
    {
        Description = "CSV file to write, or - for standard output (the default)",
        HelpName = "FILE",
    };

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("score",
            "Score vectors with the double-precision reference: free energy, log-probability (when the model has log " +
            "Z) and the unusual flag (when it has a threshold)")
        {
            _model, _input, _output, _force,
        };
        cmd.SetAction(parse =>
        {
            var modelPath = parse.GetRequiredValue(_model).FullName;
            AtomicFile.RefuseInput(parse.GetValue(_output), modelPath, parse.GetRequiredValue(_input));
            var model = ModelLoader.Load(modelPath);
            using var reader = VectorReader.Open(parse.GetRequiredValue(_input), model.Visible, ctx.In);
            VectorNames.Check(model, reader);
            TextOutput.Write(parse.GetValue(_output), parse.GetValue(_force), ctx.Out, w => Score(model, reader, w));
            return CliApp.Ok;
        });
        return cmd;
    }

    private static void Score(BoltzmannModel model, VectorReader reader, TextWriter w)
    {
        var scorer = new ReferenceScorer(model);
        var fmt = System.Globalization.CultureInfo.InvariantCulture;
        bool logP = model.LogPartition is not null, flag = model.Threshold is not null;
        w.WriteLine("index,free_energy" + (logP ? ",log_probability" : "") + (flag ? ",unusual" : ""));
        int batch = VectorBatch.Rows(model.Visible);
        var units = new byte[batch * model.Visible];
        var f = new double[batch];
        long index = 0;
        var line = new StringBuilder();
        int rows;
        while ((rows = reader.ReadBatch(units, batch)) > 0)
        {
            scorer.FreeEnergies(units, rows, f);
            for (int r = 0; r < rows; r++)
            {
                // A free energy outside double precision has no meaningful score or decision: an error, not a row.
                if (!double.IsFinite(f[r]))
                    throw new EmitException(
                        $"vector {index}: the free energy is " +
                        $"{(double.IsNaN(f[r]) ? "not a number" : "beyond double precision")}",
                        "the model's parameters are too large to score; scale them down", reader.Source);
                line.Clear().Append(index++).Append(',').Append(f[r].ToString("R", fmt));
                if (logP) line.Append(',').Append(scorer.LogProbability(f[r]).ToString("R", fmt));
                if (flag) line.Append(',').Append(f[r] > model.Threshold!.Value ? '1' : '0');
                w.WriteLine(line);
            }
        }
    }
}
