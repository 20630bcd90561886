using System.CommandLine;

namespace Emit.Cli.Commands;

/// <summary>One command of the tool: builds its System.CommandLine definition bound to a handler.</summary>
public interface ICliCommand
{
    Command Build(CliContext ctx);
}
