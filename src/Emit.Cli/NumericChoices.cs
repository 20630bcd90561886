using Emit.Emission;
using Emit.Quantize;

namespace Emit.Cli;

/// <summary>The values of <c>--numeric</c>, from the library's names of <see cref="NumericMode"/>.</summary>
public static class NumericChoices
{
    public static readonly IReadOnlyList<(string Text, NumericMode Value)> All =
        [.. new[] { NumericMode.F32, NumericMode.F64, NumericMode.Fixed }.Select(m => (m.ToText(), m))];

    public static readonly IReadOnlyList<(string Text, NumericMode? Value)> Optional =
        [.. All.Select(c => (c.Text, (NumericMode?)c.Value))];
}
