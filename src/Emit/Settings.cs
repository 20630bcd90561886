using System.Text;

namespace Emit;

/// <summary>
/// Names of <see cref="Setting"/>s inside message text. A library message refers to a setting as
/// <c>$"use {Setting.Accumulator.Ref()} int64"</c>; <see cref="EmitException"/> renders the reference with the
/// setting's project-file key unless the caller (the command line) passes its own names.
/// </summary>
public static class Settings
{
    private const char Open = '\uE000';
    private const char Close = '\uE001';

    /// <summary>The key that names the setting in project files (docs/project-file.md) and the library API.</summary>
    public static string Key(this Setting setting) => setting switch
    {
        Setting.Numeric => "numeric",
        Setting.Weights => "weights",
        Setting.Accumulator => "accumulator",
        Setting.SoftplusTable => "softplus_table",
        Setting.SelfTestVectors => "selftest_vectors",
        Setting.Targets => "targets",
        Setting.Name => "name",
        Setting.Method => "method",
        Setting.CCompiler => "cc",
        Setting.Force => "force",
        _ => setting.ToString().ToLowerInvariant(),
    };

    /// <summary>A reference to <paramref name="setting"/> for a message, rendered by <see cref="Render"/>.</summary>
    public static string Ref(this Setting setting) => $"{Open}{(int)setting}{Close}";

    /// <summary>
    /// <paramref name="text"/> with every setting reference replaced by <paramref name="name"/>'s text for it.
    /// </summary>
    public static string Render(string text, Func<Setting, string>? name = null)
    {
        if (text.IndexOf(Open) < 0) return text;
        name ??= Key;
        var sb = new StringBuilder(text.Length);
        int k = 0;
        while (k < text.Length)
        {
            int open = text.IndexOf(Open, k);
            int close = open < 0 ? -1 : text.IndexOf(Close, open);
            if (open < 0 || close < 0 || !int.TryParse(text.AsSpan(open + 1, close - open - 1), out int id))
            {
                sb.Append(text, k, text.Length - k);
                break;
            }
            sb.Append(text, k, open - k).Append(name((Setting)id));
            k = close + 1;
        }
        return sb.ToString();
    }
}
