using System.CommandLine;

namespace Emit.Cli.Commands;

public sealed class InspectCommand : ICliCommand
{
    public Command Build(CliContext ctx)
    {
        var cmd = new Command("inspect", "(not yet implemented)");
        cmd.SetAction(_ => { ctx.Error.WriteLine("emit: inspect is not implemented yet"); return CliApp.BadInput; });
        return cmd;
    }
}
