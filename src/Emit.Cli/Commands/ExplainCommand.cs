using System.CommandLine;
using System.Globalization;
using System.Text;
using Emit.Detection;
using Emit.Model;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit explain MODEL --input DATA [--top K]</c>: for each vector, the K units whose flip lowers the free energy
/// most (ΔF_i = F(v with unit i flipped) − F(v), most negative first); CSV
/// <c>index,rank,unit,name,delta_free_energy</c>
/// (docs/explain.md).
/// </summary>
public sealed class ExplainCommand : ICliCommand
{
    /// <summary>Units listed per vector unless --top says otherwise.</summary>
    public const int DefaultTop = 3;

    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "The model (.json or .npz)" }.MustExist();
    private readonly Option<string> _input = new("--input", "-i")
    {
        HelpName = "DATA",
        Description = "Vector file (CSV of 0/1, one vector per line), or - for standard input",
        Required = true,
    };
    private readonly Option<int> _top = new("--top")
    {
        HelpName = "K",
        Description = $"Units listed per vector (default {DefaultTop}; at most the model's visible units)",
        DefaultValueFactory = _ => DefaultTop,
    };
    private readonly Option<string?> _output = new("--output", "-o")
    {
        HelpName = "FILE",
        Description = "CSV file to write (default: standard output; - also means standard output)",
    };
    private readonly Option<bool> _force = CliOptions.Force();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("explain",
            "For each vector, the units whose flip lowers the free energy most: the flags that look most out of place")
        {
            _model, _input, _top, _output, _force,
        };
        cmd.SetAction(parse =>
        {
            var modelPath = parse.GetRequiredValue(_model).FullName;
            AtomicFile.RefuseInput(parse.GetValue(_output), modelPath, parse.GetRequiredValue(_input));
            var model = ModelLoader.Load(modelPath);
            int top = parse.GetValue(_top);
            if (top < 1) throw new EmitException($"--top {top} is less than 1", "list at least one unit per vector");
            top = Math.Min(top, model.Visible);
            var explainer = new UnitFlipExplainer(model);
            using var reader = VectorReader.Open(parse.GetRequiredValue(_input), model.Visible, ctx.In);
            VectorNames.Check(model, reader);
            var names = !model.Names.IsEmpty ? model.Names : reader.Names;
            TextOutput.Write(parse.GetValue(_output), parse.GetValue(_force), ctx.Out,
                w => Write(explainer, names, top, reader, w));
            return CliApp.Ok;
        });
        return cmd;
    }

    private static void Write(UnitFlipExplainer explainer, IReadOnlyList<string> names, int top, VectorReader reader,
        TextWriter w)
    {
        w.WriteLine("index,rank,unit,name,delta_free_energy");
        var units = new byte[explainer.Model.Visible];
        var line = new StringBuilder();
        long index = 0;
        while (reader.TryRead(units))
        {
            var flips = explainer.Top(units, top);
            for (int r = 0; r < flips.Count; r++)
            {
                var f = flips[r];
                line.Clear().Append(index).Append(',').Append(r + 1).Append(',').Append(f.Unit).Append(',')
                    .Append(Csv(names.Count > f.Unit ? names[f.Unit] : "")).Append(',')
                    .Append(f.DeltaFreeEnergy.ToString("R", CultureInfo.InvariantCulture));
                w.WriteLine(line);
            }
            index++;
        }
    }

    /// <summary>A CSV field: quoted when it holds a comma, quote or line break (RFC 4180).</summary>
    private static string Csv(string s) =>
        s.AsSpan().IndexOfAny(",\"\r\n") < 0 ? s : "\"" + s.Replace("\"", "\"\"") + "\"";
}
