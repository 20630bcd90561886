using System.Collections.Immutable;
using System.Text;

namespace Emit.Demo;

/// <summary>Names and count of the demo fleet's status flags.</summary>
public static class ReeferFlags
{
    /// <summary>Number of flags (visible units of the demo model).</summary>
    public static readonly int Count = Enum.GetValues<ReeferFlag>().Length;

    /// <summary>The flag names in column order: snake_case of the <see cref="ReeferFlag"/> members.</summary>
    public static readonly ImmutableArray<string> Names =
        Enum.GetValues<ReeferFlag>().OrderBy(f => (int)f).Select(f => SnakeCase(f.ToString())).ToImmutableArray();

    /// <summary>The file name of one flag, e.g. <c>evaporator_fan_hi</c>.</summary>
    public static string Name(ReeferFlag flag) => Names[(int)flag];

    /// <summary>"EvaporatorFanHi" → "evaporator_fan_hi".</summary>
    internal static string SnakeCase(string pascal)
    {
        var sb = new StringBuilder(pascal.Length + 8);
        for (int i = 0; i < pascal.Length; i++)
        {
            char c = pascal[i];
            if (char.IsAsciiLetterUpper(c))
            {
                if (i > 0) sb.Append('_');
                sb.Append(char.ToLowerInvariant(c));
            }
            else sb.Append(c);
        }
        return sb.ToString();
    }
}
