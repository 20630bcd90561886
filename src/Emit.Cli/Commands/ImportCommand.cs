using System.CommandLine;
using Emit.Model;

namespace Emit.Cli.Commands;

/// <summary><c>emit import MODEL.npz -o MODEL.json [--names FILE] [--threshold T]</c>.</summary>
public sealed class ImportCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "Model to convert (.npz or .json)" }.MustExist();
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly (Option<string> Output, Option<string> Former) _output = CliOptions.Output(
        "Model JSON file to write, or - for standard output");

    private readonly Option<FileInfo?> _names = new Option<FileInfo?>("--names")
    {
        Description = "Unit names, in unit order: a CSV whose header row names the units, or one name per line",
        HelpName = "FILE",
    }.MustExist();

    private readonly Option<double?> _threshold = new("--threshold")
    {
        Description = "Decision threshold to store in the model: a free energy above it means unusual",
        HelpName = "T",
    };

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("import",
            "Convert a NumPy .npz model (weights/visible_bias/hidden_bias, or scikit-learn BernoulliRBM attributes) " +
            "to a model JSON file, with unit names and a threshold")
        {
            _model, _output.Output, _output.Former, _names, _threshold, _force,
        };
        cmd.SetAction(parse =>
        {
            var modelPath = parse.GetRequiredValue(_model).FullName;
            var outPath = CliOptions.ReadOutput(parse, _output, ctx.Error)
                          ?? throw new EmitException("no output file given",
                              "name one with -o/--output FILE, or - for standard output");
            var namesPath = parse.GetValue(_names)?.FullName;
            AtomicFile.RefuseInput(outPath, modelPath, namesPath);
            var model = ModelLoader.Load(modelPath);
            if (namesPath is not null || parse.GetValue(_threshold) is not null)
            {
                try
                {
                    model = new BoltzmannModel(model.Kind, model.Visible, model.Hidden, model.VisibleBias,
                        model.HiddenBias, model.Weights,
                        model.VisibleLinks, model.HiddenLinks,
                        namesPath is null ? model.Names : UnitNameFile.Read(namesPath, model.Visible),
                        parse.GetValue(_threshold) ?? model.Threshold, model.LogPartition, model.MetadataJson);
                }
                catch (EmitException e) when (e.File is null)
                {
                    throw e.InFile(namesPath ?? modelPath);
                }
            }
            var text = ModelJson.ToText(model);
            TextOutput.Write(outPath, parse.GetValue(_force), ctx.Out, w => w.Write(text));
            var report = TextOutput.IsStdout(outPath) ? ctx.Error : ctx.Out;
            report.WriteLine(
                $"wrote {(TextOutput.IsStdout(outPath) ? "standard output" : Path.GetFullPath(outPath))} " +
                             $"({model.Kind.ToText()}, {model.Visible} visible, {model.Hidden} hidden, sha256 " +
                             $"{model.Sha256})");
            if (model.Names.IsEmpty)
                ctx.Error.WriteLine(
                    "emit: note: the model has no unit names, so generated code and vector headers number the units; " +
                                    "give them with --names FILE");
            if (model.Threshold is null)
                ctx.Error.WriteLine(
                    "emit: note: the model has no threshold, so scorers cannot decide unusual states; give one with " +
                    "--threshold T");
            return CliApp.Ok;
        });
        return cmd;
    }
}
