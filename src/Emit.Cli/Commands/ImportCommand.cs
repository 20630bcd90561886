using System.CommandLine;
using Emit.Model;

namespace Emit.Cli.Commands;

/// <summary><c>emit import MODEL.npz --out MODEL.json</c>.</summary>
public sealed class ImportCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model = new("MODEL") { Description = "Model to convert (.npz or .json)" };
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<FileInfo> _out = new("--out", "-o") { Description = "Model JSON file to write", Required = true };

    public Command Build(CliContext ctx)
    {
        _model.AcceptExistingOnly();
        var cmd = new Command("import", "Convert a NumPy .npz model (weights/visible_bias/hidden_bias, or scikit-learn BernoulliRBM attributes) to a model JSON file")
        {
            _model, _out, _force,
        };
        cmd.SetAction(parse =>
        {
            var model = ModelLoader.Load(parse.GetRequiredValue(_model).FullName);
            var outPath = parse.GetRequiredValue(_out).FullName;
            ModelJson.WriteFile(model, outPath, parse.GetValue(_force));
            ctx.Out.WriteLine($"wrote {outPath} ({model.Kind.ToText()}, {model.Visible} visible, {model.Hidden} hidden, sha256 {model.Sha256})");
            return CliApp.Ok;
        });
        return cmd;
    }
}
