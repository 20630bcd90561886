using System.CommandLine;
using System.CommandLine.Parsing;
using System.Globalization;
using System.Numerics;

namespace Emit.Cli;

/// <summary>
/// Options that several commands share, and the builders every command uses for typed options, so options read and
/// fail the same everywhere (docs/cli.md): one wording for a missing file, one for a bad number, one for a bad choice.
/// </summary>
public static class CliOptions
{
    /// <summary><c>--force</c>: replace output files emit did not write (docs/cli.md, "Files emit writes").</summary>
    public static Option<bool> Force() => new("--force")
    {
        Description = "Replace existing output files even when emit did not write them (or they were changed after)",
    };

    /// <summary>
    /// The one message for an input file that is not there (the library's model, vector and project readers say the
    /// same).
    /// </summary>
    public static string FileNotFound(string path) => $"{path}: file not found (check the path)";

    /// <summary>
    /// Requires the files an argument names to exist, with the message of <see cref="FileNotFound"/>.
    /// </summary>
    public static Argument<T> MustExist<T>(this Argument<T> argument)
    {
        argument.Validators.Add(r =>
        {
            foreach (var token in r.Tokens)
                if (!File.Exists(token.Value) && !Directory.Exists(token.Value))
                {
                    r.AddError(FileNotFound(token.Value));
                    return;
                }
        });
        return argument;
    }

    /// <summary>
    /// Requires the file or folder an option names to exist, with the message of <see cref="FileNotFound"/>.
    /// </summary>
    public static Option<T> MustExist<T>(this Option<T> option)
    {
        option.Validators.Add(r =>
        {
            foreach (var token in r.Tokens)
                if (!File.Exists(token.Value) && !Directory.Exists(token.Value))
                {
                    r.AddError(FileNotFound(token.Value));
                    return;
                }
        });
        return option;
    }

    /// <summary>
    /// An option with a fixed set of choices, typed: <paramref name="choices"/> maps each allowed text to its value;
    /// --help shows them as <c>&lt;a|b|c&gt;</c> and the default by its text, and anything else is one usage error
    /// naming them. Read it with <c>parse.GetValue(option)!.Value</c>.
    /// </summary>
    public static Option<Chosen<T>> Choice<T>(string name, string description,
        IReadOnlyList<(string Text, T Value)> choices, string? defaultText = null)
    {
        var list = string.Join(", ", choices.Select(c => c.Text));
        var option = new Option<Chosen<T>>(name)
        {
            Description = description,
            HelpName = string.Join("|", choices.Select(c => c.Text)),
            CustomParser = r =>
            {
                var text = r.Tokens.Count > 0 ? r.Tokens[^1].Value : defaultText ?? "";
                foreach (var (t, v) in choices)
                    if (t == text) return new Chosen<T>(t, v);
                r.AddError($"{name}: '{text}' is not one of {list}");
                return null;
            },
        };
        if (defaultText is not null)
        {
            var value = choices.First(c => c.Text == defaultText).Value;
            option.DefaultValueFactory = _ => new Chosen<T>(defaultText, value);
        }
        option.CompletionSources.Add(choices.Select(c => c.Text).ToArray());
        return option;
    }

    /// <summary>
    /// A comma-separated list of choices (<c>--target c,csharp</c>), checked against <paramref name="allowed"/>;
    /// --help shows them as <c>&lt;a|b,...&gt;</c>.
    /// </summary>
    public static Option<string[]> ChoiceList(string name, string description, IReadOnlyList<string> allowed,
        string defaultText)
    {
        var list = string.Join(", ", allowed);
        var option = new Option<string[]>(name)
        {
            Description = description,
            HelpName = string.Join("|", allowed) + ",...",
            CustomParser = r =>
            {
                var text = r.Tokens.Count > 0 ? r.Tokens[^1].Value : defaultText;
                var parts = text.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
                if (parts.Length == 0) r.AddError($"{name}: give one or more of {list}");
                foreach (var p in parts)
                    if (!allowed.Contains(p))
                    {
                        r.AddError($"{name}: '{p}' is not one of {list}");
                        break;
                    }
                return parts.Distinct().ToArray();
            },
            DefaultValueFactory = _ => defaultText.Split(','),
        };
        option.CompletionSources.Add(allowed.ToArray());
        return option;
    }

    /// <summary>
    /// A whole-number option from <paramref name="min"/> to <paramref name="max"/>; anything else is one usage error
    /// saying so.
    /// </summary>
    public static Option<T> Number<T>(string name, string description, T min, T max, T? defaultValue = null,
        string[]? aliases = null)
        where T : struct, IBinaryInteger<T>, IMinMaxValue<T>
    {
        var option = new Option<T>(name, aliases ?? [])
        {
            Description = description,
            HelpName = "N",
            CustomParser = r =>
            {
                var text = r.Tokens.Count > 0 ? r.Tokens[^1].Value : "";
                if (T.TryParse(text, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out var v) && v >= min
                    && v <= max)
                    return v;
                r.AddError($"{name}: '{text}' is not a whole number from {min} to {max}");
                return default;
            },
        };
        if (defaultValue is { } d) option.DefaultValueFactory = _ => d;
        return option;
    }

    /// <summary>
    /// A real-number option read in the invariant culture (<c>0.05</c> everywhere, never <c>0,05</c>); range checks are
    /// left to the library, which names the setting.
    /// </summary>
    public static Option<double> Real(string name, string description, double defaultValue)
    {
        return new Option<double>(name)
        {
            Description = description,
            HelpName = "X",
            DefaultValueFactory = _ => defaultValue,
            CustomParser = r =>
            {
                var text = r.Tokens.Count > 0 ? r.Tokens[^1].Value : "";
                if (double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v)) return v;
                r.AddError($"{name}: '{text}' is not a number (write it as 0.05 or 5e-2)");
                return default;
            },
        };
    }

    /// <summary>
    /// The output file of a command that writes one (<c>-o/--output FILE</c>, <c>-</c> for standard output), with the
    /// hidden former spelling <c>--out FILE</c> kept for one release (docs/cli.md, "Former spellings").
    /// </summary>
    public static (Option<string> Output, Option<string> Former) Output(string description) =>
        (new Option<string>("--output", "-o") { Description = description, HelpName = "FILE" },
         new Option<string>("--out") { Hidden = true, Description = "Former spelling of --output" });

    /// <summary>
    /// The output named by <see cref="Output"/>'s pair, warning about the former spelling; null when neither was given.
    /// </summary>
    public static string? ReadOutput(ParseResult parse, (Option<string> Output, Option<string> Former) options,
        TextWriter error)
    {
        var output = parse.GetValue(options.Output);
        var former = parse.GetValue(options.Former);
        if (former is null) return output;
        if (output is not null)
            throw new EmitException("-o/--output and its former spelling --out are both given",
                "give -o/--output only");
        error.WriteLine(
            "emit: warning: --out FILE is now -o/--output FILE here; the old spelling goes in the next release");
        return former;
    }
}
