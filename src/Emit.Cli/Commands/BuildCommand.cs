using System.CommandLine;
using Emit.Project;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit build PROJECT</c>: generates every scorer a project file lists, as <c>emit compile</c> would.
/// </summary>
public sealed class BuildCommand : ICliCommand
{
    private readonly Argument<FileInfo> _project = new Argument<FileInfo>("PROJECT")
    {
        Description = "Project file (format emit.project): the models and compile options of every scorer and " +
            "classifier to generate",
    }.MustExist();

    private readonly Option<bool> _force = CliOptions.Force();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("build",
            "Generate every scorer and classifier listed in a project file; nothing is written unless all of " +
            "them compile")
        {
            _project, _force,
        };
        cmd.SetAction(parse =>
        {
            var project = ProjectFile.Read(parse.GetRequiredValue(_project).FullName);
            foreach (var path in ProjectBuilder.Build(project, parse.GetValue(_force)))
                ctx.Out.WriteLine($"wrote {path}");
            return CliApp.Ok;
        });
        return cmd;
    }
}
