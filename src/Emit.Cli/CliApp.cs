using System.CommandLine;
using Emit.Cli.Commands;

namespace Emit.Cli;

/// <summary>Builds the command tree and runs it; every known error becomes one line on stderr and exit code 2.</summary>
public static class CliApp
{
    public const int Ok = 0;
    public const int CheckFailed = 1;
    public const int BadInput = 2;

    public static readonly Option<bool> Verbose = new("--verbose")
    {
        Description = "Show the full exception on errors",
        Recursive = true,
    };

    public static RootCommand BuildRoot(CliContext ctx)
    {
        var root = new RootCommand(
            "emit: compiles a trained Boltzmann-machine model into small C99/C# free-energy scorers and checks them " +
            "against a double-precision reference. A monitoring aid, not a safety function.");
        root.Options.Add(Verbose);
        foreach (var command in new ICliCommand[]
                 {
                     new InspectCommand(), new CompileCommand(), new BuildCommand(), new VerifyCommand(), new DiffCommand(), new ClassifyCommand(), new ScoreCommand(), new LogzCommand(), new VectorsCommand(), new ImportCommand(), new TrainCommand(), new DemoCommand(),
                 })
            root.Subcommands.Add(command.Build(ctx));
        return root;
    }

    public static int Run(string[] args, TextWriter stdout, TextWriter stderr, Stream? stdin = null)
    {
        var ctx = new CliContext(stdout, stderr, stdin);
        var root = BuildRoot(ctx);
        var parse = root.Parse(args);
        bool verbose = parse.GetValue(Verbose);
        if (parse.Errors.Count > 0)
        {
            foreach (var e in parse.Errors)
                stderr.WriteLine($"emit: error: {e.Message} (see emit --help)");
            return BadInput;
        }
        try
        {
            return parse.Invoke(new InvocationConfiguration { Output = stdout, Error = stderr, EnableDefaultExceptionHandler = false });
        }
        catch (EmitException e)
        {
            stderr.WriteLine("emit: error: " + e.OneLine());
            if (verbose) stderr.WriteLine(e);
            return BadInput;
        }
        catch (Exception e) when (!verbose)
        {
            stderr.WriteLine($"emit: internal error: {e.GetType().Name}: {e.Message.Replace('\n', ' ')} (run with --verbose for details, and please report it)");
            return 3;
        }
    }
}
