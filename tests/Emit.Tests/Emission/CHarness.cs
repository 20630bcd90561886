using System.Globalization;

namespace Emit.Tests.Emission;

/// <summary>
/// Builds a generated C scorer with a test main that reads one input per line ('0'/'1' per unit) and prints, per
/// input, the free energy from the packed entry point (round-trip precision; in fixed mode the integer), whether the
/// units entry point gave the same bits, and the decision; the first line is the self-test result.
/// </summary>
internal static class CHarness
{
    /// <summary>One output line; in fixed mode <see cref="Integer"/> is the returned integer and <see cref="Energy"/> the same value as a double.</summary>
    public sealed record Row(double Energy, bool SameBits, int Unusual, long Integer = 0);

    public sealed record Result(int SelfTestFailures, IReadOnlyList<Row> Rows);

    public static string MainSource(string name, bool hasThreshold, bool integer = false) => $$"""
        #include <stdio.h>
        #include <string.h>
        #include "{{name}}.h"

        int main(void)
        {
            static char line[{{name.ToUpperInvariant()}}_VISIBLE + 16];
            printf("selftest %d\n", {{name}}_selftest());
            while (fgets(line, (int)sizeof line, stdin) != NULL) {
                uint8_t units[{{name.ToUpperInvariant()}}_VISIBLE];
                uint8_t packed[{{name.ToUpperInvariant()}}_PACKED_BYTES];
                {{name}}_energy_t e1, e2;
                int i;
                memset(packed, 0, sizeof packed);
                for (i = 0; i < {{name.ToUpperInvariant()}}_VISIBLE; ++i) {
                    /* any nonzero byte means on */
                    units[i] = (uint8_t)(line[i] == '1' ? 1 + i % 200 : 0);
                    if (units[i] != 0) packed[i >> 3] = (uint8_t)(packed[i >> 3] | (1u << (i & 7)));
                }
                /* bits beyond the last unit must be ignored */
                if ({{name.ToUpperInvariant()}}_VISIBLE % 8 != 0)
                    packed[{{name.ToUpperInvariant()}}_PACKED_BYTES - 1] = (uint8_t)(packed[{{name.ToUpperInvariant()}}_PACKED_BYTES - 1] | (0xFFu << ({{name.ToUpperInvariant()}}_VISIBLE % 8)));
                e1 = {{name}}_free_energy(packed);
                e2 = {{name}}_free_energy_units(units);
                printf("{{(integer ? "%lld" : "%.17g")}} %d %d\n", {{(integer ? "(long long)e1" : "(double)e1")}}, memcmp(&e1, &e2, sizeof e1) == 0, {{(hasThreshold ? name + "_is_unusual(e1)" : "-1")}});
            }
            return 0;
        }
        """;

    /// <summary>Compiles NAME.c and the test main in <paramref name="dir"/> with the strict flags (plus extra flags).</summary>
    public static string Build(string dir, string name, bool hasThreshold, string extraFlags = "", bool integer = false)
    {
        var cc = Toolchain.Require("cc");
        File.WriteAllText(Path.Combine(dir, "main_" + name + ".c"), MainSource(name, hasThreshold, integer));
        var exe = Path.Combine(dir, "run_" + name);
        Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), .. Toolchain.Split(extraFlags), "-O2", "-I", dir,
            Path.Combine(dir, name + ".c"), Path.Combine(dir, "main_" + name + ".c"), "-o", exe, "-lm"]);
        return exe;
    }

    public static Result Run(string exe, IEnumerable<byte[]> vectors)
    {
        var input = string.Concat(vectors.Select(v => CodegenCases.Bits(v) + "\n"));
        var output = Toolchain.RunOk(exe, [], stdin: input);
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.StartsWith("selftest ", lines[0]);
        var rows = lines.Skip(1).Select(l =>
        {
            var p = l.Split(' ');
            bool isInteger = long.TryParse(p[0], NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out long n);
            return new Row(isInteger ? n : double.Parse(p[0], CultureInfo.InvariantCulture), p[1] == "1", int.Parse(p[2], CultureInfo.InvariantCulture), isInteger ? n : 0);
        }).ToArray();
        return new Result(int.Parse(lines[0]["selftest ".Length..], CultureInfo.InvariantCulture), rows);
    }
}
