using System.CommandLine;

namespace Emit.Cli.Commands;

public sealed class ScoreCommand : ICliCommand
{
    public Command Build(CliContext ctx)
    {
        var cmd = new Command("score", "(not yet implemented)");
        cmd.SetAction(_ => { ctx.Error.WriteLine("emit: score is not implemented yet"); return CliApp.BadInput; });
        return cmd;
    }
}
