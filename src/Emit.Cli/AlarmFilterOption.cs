using System.CommandLine;
using Emit.Detection;

namespace Emit.Cli;

/// <summary>
/// <c>--alarm-filter K/N</c> of compile and verify: emit (or check) the K-of-N alarm filter beside the scorer
/// (docs/generated-code.md, "Alarm filter").
/// </summary>
internal static class AlarmFilterOption
{
    /// <summary>The option, with its help text.</summary>
    public static Option<string?> Create(string description) => new("--alarm-filter")
    {
        HelpName = "K/N",
        Description = description,
    };

    /// <summary>The parsed K/N, or null when the option was not given; a bad value is a one-line error (exit 2).
    /// </summary>
    public static AlarmFilterSpec? Read(ParseResult parse, Option<string?> option)
    {
        if (parse.GetValue(option) is not { } text) return null;
        try
        {
            return AlarmFilterSpec.Parse(text);
        }
        catch (EmitException e) when (e.File is null)
        {
            throw new EmitException("--alarm-filter: " + e.Problem, e.Hint, null, null, null, e);
        }
    }
}
