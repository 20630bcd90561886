using System.CommandLine;
using System.CommandLine.Parsing;
using System.Text.RegularExpressions;

namespace Emit.Cli;

/// <summary>
/// Turns System.CommandLine's parse errors into emit's one line (docs/cli.md, "Errors"): the first error only, folded
/// onto one line, without .NET type names, with a "did you mean" for a mistyped command or option and a pointer to
/// the help of the command being run.
/// </summary>
public static partial class UsageErrors
{
    /// <summary>The one-line message (without the <c>emit: error: </c> prefix) for a parse that has errors.</summary>
    public static string OneLine(ParseResult parse)
    {
        var command = parse.CommandResult.Command;
        var help = $"see {CommandPath(parse.CommandResult)} --help";
        // a mistyped option after an argument that takes several files (compile MODEL1 MODEL2 ...) is read as one more
        // file; say what it is rather than "file not found"
        var swallowed = parse.CommandResult.Children.OfType<ArgumentResult>().SelectMany(a => a.Tokens)
            .Select(t => t.Value)
            .FirstOrDefault(v => v.StartsWith("--", StringComparison.Ordinal)
                                 && !File.Exists(v) && !Directory.Exists(v));
        if (parse.UnmatchedTokens.Count > 0 || swallowed is not null)
        {
            var token = parse.UnmatchedTokens.Count > 0 ? parse.UnmatchedTokens[0] : swallowed!;
            if (token.StartsWith('-'))
            {
                var names = OptionNames(parse.CommandResult);
                var guess = Closest(token.Split('=', 2)[0], names);
                return $"unknown option '{token}' ({(guess is null ? "" : $"did you mean {guess}? ")}{help})";
            }
            if (command.Subcommands.Count > 0 && parse.CommandResult.Children.All(c => c is not ArgumentResult))
            {
                var guess = Closest(token, command.Subcommands.Where(c => !c.Hidden).Select(c => c.Name));
                var hint = guess is null ? help
                    : $"did you mean {guess}? see {CommandPath(parse.CommandResult)} {guess} --help";
                return $"unknown command '{token}' ({hint})";
            }
            return $"unexpected argument '{token}' ({help})";
        }
        var message = Fold(parse.Errors[0].Message);
        if (message == "Required command was not provided.")
            return $"no command given ({help})";
        return message.EndsWith(')') ? message : $"{message.TrimEnd('.')} ({help})";
    }

    /// <summary>"emit compile" for the command a parse reached.</summary>
    public static string CommandPath(CommandResult result)
    {
        var names = new List<string>();
        for (SymbolResult? r = result; r is not null; r = r.Parent)
            if (r is CommandResult c) names.Add(c.Parent is null ? "emit" : c.Command.Name);
        names.Reverse();
        return string.Join(' ', names);
    }

    /// <summary>One line, .NET type names replaced by what the value should look like.</summary>
    public static string Fold(string message)
    {
        var text = CannotParse().Replace(message, m =>
            $"{m.Groups["symbol"].Value}: '{m.Groups["value"].Value}' is not {Expected(m.Groups["type"].Value)}");
        text = MustBeOneOf().Replace(text, m =>
            "must be one of " +
            string.Join(", ", Quoted().Matches(m.Groups["list"].Value).Select(q => q.Groups[1].Value)));
        text = TypeName().Replace(text, m => Expected(m.Value.Trim('\'')));
        return Whitespace().Replace(text, " ").Trim();
    }

    private static string Expected(string type) => type switch
    {
        "System.Int32" => "a whole number from -2147483648 to 2147483647",
        "System.Int64" => "a whole number from -9223372036854775808 to 9223372036854775807",
        "System.UInt32" => "a whole number from 0 to 4294967295",
        "System.UInt64" => "a whole number from 0 to 18446744073709551615",
        "System.Double" or "System.Single" => "a number",
        "System.Boolean" => "true or false",
        "System.IO.FileInfo" => "a file name",
        "System.IO.DirectoryInfo" => "a folder name",
        _ => "a value of the expected kind",
    };

    private static IEnumerable<string> OptionNames(CommandResult result)
    {
        for (SymbolResult? r = result; r is not null; r = r.Parent)
            if (r is CommandResult c)
                foreach (var o in c.Command.Options)
                    if (!o.Hidden && (ReferenceEquals(c, result) || o.Recursive))
                        foreach (var name in o.Aliases.Prepend(o.Name))
                            if (name.StartsWith("--", StringComparison.Ordinal)) yield return name;
    }

    /// <summary>
    /// The candidate nearest to <paramref name="token"/> by edit distance (Levenshtein), if within a third of its
    /// length (at least 1), or one that <paramref name="token"/> is a prefix of; null when none is close.
    /// </summary>
    public static string? Closest(string token, IEnumerable<string> candidates)
    {
        string? best = null;
        int bestDistance = int.MaxValue;
        foreach (var c in candidates.Distinct())
        {
            int d = token.Length >= 3 && c.StartsWith(token, StringComparison.Ordinal) ? 1 : Distance(token, c);
            if (d <= Math.Max(1, c.Length / 3) && d < bestDistance)
            {
                best = c;
                bestDistance = d;
            }
        }
        return best;
    }

    private static int Distance(string a, string b)
    {
        var prev = new int[b.Length + 1];
        var cur = new int[b.Length + 1];
        for (int j = 0; j <= b.Length; j++) prev[j] = j;
        for (int i = 1; i <= a.Length; i++)
        {
            cur[0] = i;
            for (int j = 1; j <= b.Length; j++)
                cur[j] = Math.Min(Math.Min(cur[j - 1] + 1, prev[j] + 1), prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1));
            (prev, cur) = (cur, prev);
        }
        return prev[b.Length];
    }

    [GeneratedRegex(
        @"Cannot parse argument '(?<value>.*?)' for (option|argument|command) '(?<symbol>.*?)' as expected type " +
        @"'(?<type>[\w.`\[\]]+)'\.?")]
    private static partial Regex CannotParse();

    [GeneratedRegex(@"Must be one of:(?<list>(\s*'[^']*')+)")]
    private static partial Regex MustBeOneOf();

    [GeneratedRegex(@"'([^']*)'")]
    private static partial Regex Quoted();

    [GeneratedRegex(@"'System\.[\w.]+'")]
    private static partial Regex TypeName();

    [GeneratedRegex(@"\s+")]
    private static partial Regex Whitespace();
}
