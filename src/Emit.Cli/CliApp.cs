using System.CommandLine;
using Emit.Cli.Commands;

namespace Emit.Cli;

/// <summary>
/// Builds the command tree and runs it: exit 0 success, 1 a check failed, 2 bad input or usage (one line on stderr),
/// 3 an internal error (the trace only with --verbose). Everything written to standard output and standard error
/// passes <see cref="TerminalText"/>, so control characters from a model never reach a terminal.
/// </summary>
public static class CliApp
{
    public const int Ok = 0;
    public const int CheckFailed = 1;
    public const int BadInput = 2;
    public const int InternalError = 3;

    public static readonly Option<bool> Verbose = new("--verbose")
    {
        Description = "Show the stack trace with an error",
        Recursive = true,
    };

    /// <summary>
    /// The command tree. The root is a plain command named <c>emit</c> rather than System.CommandLine's root command,
    /// which takes its name from the running executable (<c>testhost</c> under tests, <c>dotnet</c> for some
    /// launchers) and adds directives emit does not use.
    /// </summary>
    public static Command BuildRoot(CliContext ctx)
    {
        var root = new Command("emit",
            "emit: compiles a trained Boltzmann-machine model into small C99/C# free-energy scorers and checks them " +
            "against a double-precision reference. A monitoring aid, not a safety function.");
        root.Options.Add(new System.CommandLine.Help.HelpOption
        {
            Action = new System.CommandLine.Help.HelpAction { MaxWidth = HelpWidth },
        });
        root.Options.Add(new VersionOption());
        root.Options.Add(Verbose);
        foreach (var command in new ICliCommand[]
                 {
                     new InspectCommand(), new CompileCommand(), new BuildCommand(), new VerifyCommand(),
                         new DiffCommand(), new CalibrateCommand(), new ExplainCommand(), new TrainCommand(),
                         new ClassifyCommand(), new ScoreCommand(), new LogzCommand(), new VectorsCommand(),
                         new ImportCommand(), new DemoCommand(),
                 })
            root.Subcommands.Add(command.Build(ctx));
        return root;
    }

    /// <summary>
    /// Options that took a value in an earlier release and are switches now: (command, option, new option).
    /// </summary>
    private static readonly (string Command, string Option, string Replacement)[] FormerValueOptions =
    [
        ("diff", "--json", "--report"),
    ];

    /// <summary>
    /// Parser settings: no response files (an argument starting with @ is a plain argument; docs/cli.md).
    /// </summary>
    public static ParserConfiguration ParserSettings() => new() { ResponseFileTokenReplacer = null };

    public static int Run(string[] args, TextWriter stdout, TextWriter stderr, Stream? stdin = null)
    {
        bool errorIsConsole = ReferenceEquals(stderr, Console.Error);
        stdout = TerminalText.Wrap(stdout);
        stderr = TerminalText.Wrap(stderr);
        bool verbose = args.Contains(Verbose.Name);
        try
        {
            var ctx = new CliContext(stdout, stderr, stdin, errorIsConsole);
            var root = BuildRoot(ctx);
            var parse = root.Parse(args, ParserSettings());
            if (parse.Errors.Count > 0 && FormerSpelling(parse, args) is { } rewritten)
            {
                stderr.WriteLine($"emit: warning: {rewritten.Note}");
                parse = root.Parse(rewritten.Args, ParserSettings());
            }
            if (parse.Errors.Count > 0)
            {
                stderr.WriteLine("emit: error: " + UsageErrors.OneLine(parse));
                return BadInput;
            }
            return parse.Invoke(new InvocationConfiguration
            {
                Output = stdout,
                Error = stderr,
                EnableDefaultExceptionHandler = false,
            });
        }
        catch (EmitException e)
        {
            stderr.WriteLine("emit: error: " + e.OneLine(SettingFlags.Render));
            if (verbose) stderr.WriteLine(e);
            return BadInput;
        }
        catch (Exception e)
        {
            stderr.WriteLine($"emit: internal error: {UsageErrors.Fold(e.Message)} " +
                             (verbose ? "(please report it with the trace below)"
                                 : "(run with --verbose for the trace, and please report it)"));
            if (verbose) stderr.WriteLine(e);
            return InternalError;
        }
    }

    /// <summary>Width that --help wraps at, fixed so help text is the same on every terminal.</summary>
    public const int HelpWidth = 120;

    private static (string[] Args, string Note)? FormerSpelling(ParseResult parse, string[] args)
    {
        if (parse.UnmatchedTokens.Count == 0) return null;
        var command = parse.CommandResult.Command.Name;
        foreach (var (cmd, option, replacement) in FormerValueOptions)
        {
            if (cmd != command) continue;
            int k = Array.IndexOf(args, option);
            if (k < 0 || k + 1 >= args.Length || !parse.UnmatchedTokens.Contains(args[k + 1])) continue;
            var fixedArgs = args.ToArray();
            fixedArgs[k] = replacement;
            return (fixedArgs,
                $"{option} FILE is now {replacement} FILE ({option} alone writes JSON to standard output); " +
                               $"the old spelling goes in the next release");
        }
        return null;
    }
}
