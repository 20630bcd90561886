using System.Runtime.CompilerServices;
using Emit.Cli;

namespace Emit.Tests.Cli;

/// <summary>
/// The --help of the root and of every command, as approved files next to this test (Cli/help/COMMAND.approved.txt),
/// so the vocabulary of docs/cli.md is reviewed whenever an option changes. Commands are discovered from the command
/// tree: a new command fails here until its help is approved. On a mismatch the test writes COMMAND.received.txt
/// beside the approved file and fails; to approve, review the difference and rename the received file, or run the
/// tests with EMIT_APPROVE=1 to write every approved file from the current help.
/// </summary>
public sealed class HelpApprovalTests
{
    public static TheoryData<string> Commands() => [.. CommandNames()];

    private static IEnumerable<string> CommandNames() =>
        CliApp.BuildRoot(new CliContext(TextWriter.Null, TextWriter.Null)).Subcommands.Where(c => !c.Hidden).Select(c => c.Name).Prepend("");

    [Theory]
    [MemberData(nameof(Commands))]
    public void Help_matches_the_approved_file(string command)
    {
        var args = command.Length == 0 ? new[] { "--help" } : new[] { command, "--help" };
        var r = CliRunner.Run(args);
        Assert.Equal(0, r.ExitCode);
        Assert.Equal("", r.Error);
        var name = command.Length == 0 ? "emit" : command;
        var approved = Path.Combine(HelpFolder(), name + ".approved.txt");
        var received = Path.Combine(HelpFolder(), name + ".received.txt");
        if (Environment.GetEnvironmentVariable("EMIT_APPROVE") == "1")
        {
            File.WriteAllText(approved, r.Out);
            File.Delete(received);
            return;
        }
        var expected = File.Exists(approved) ? File.ReadAllText(approved).ReplaceLineEndings("\n") : null;
        if (expected == r.Out)
        {
            File.Delete(received);
            return;
        }
        File.WriteAllText(received, r.Out);
        Assert.Fail(expected is null
            ? $"no approved help for '{name}': review {received} and rename it to {Path.GetFileName(approved)}"
            : $"help of '{name}' changed: compare {received} with {approved}, then rename it if the change is meant");
    }

    [Fact]
    public void Every_approved_file_belongs_to_a_command()
    {
        var names = CommandNames().Select(c => c.Length == 0 ? "emit" : c).ToHashSet();
        foreach (var file in Directory.GetFiles(HelpFolder(), "*.approved.txt"))
            Assert.Contains(Path.GetFileName(file)[..^".approved.txt".Length], names);
    }

    private static string HelpFolder([CallerFilePath] string here = "") => Path.Combine(Path.GetDirectoryName(here)!, "help");
}
