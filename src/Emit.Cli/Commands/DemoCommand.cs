using System.CommandLine;

namespace Emit.Cli.Commands;

public sealed class DemoCommand : ICliCommand
{
    public Command Build(CliContext ctx)
    {
        var cmd = new Command("demo", "(not yet implemented)");
        cmd.SetAction(_ => { ctx.Error.WriteLine("emit: demo is not implemented yet"); return CliApp.BadInput; });
        return cmd;
    }
}
