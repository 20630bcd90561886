using System.CommandLine;

namespace Emit.Cli.Commands;

public sealed class LogzCommand : ICliCommand
{
    public Command Build(CliContext ctx)
    {
        var cmd = new Command("logz", "(not yet implemented)");
        cmd.SetAction(_ => { ctx.Error.WriteLine("emit: logz is not implemented yet"); return CliApp.BadInput; });
        return cmd;
    }
}
