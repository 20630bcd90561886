namespace Emit.Harness;

/// <summary>The compiler flags every C compile of generated code uses (the code-generation contract).</summary>
public static class CFlags
{
    /// <summary>Strict C99: the generated C and the harness main must compile clean with these.</summary>
    public const string Strict = "-std=c99 -Wall -Wextra -Wpedantic -Wconversion -Wshadow -Wstrict-prototypes -Werror";

    /// <summary>The same for a C++17 compile of the generated C (-Wstrict-prototypes is C only).</summary>
    public const string StrictCpp = "-std=c++17 -x c++ -Wall -Wextra -Wpedantic -Wconversion -Wshadow -Werror";

    /// <summary>
    /// Cortex-M3 (no FPU, soft float). -ffp-contract=off keeps gcc from fusing multiply-adds, which would change float
    /// rounding against the host.
    /// </summary>
    public const string CortexM3 = "-mcpu=cortex-m3 -mthumb -mfloat-abi=soft -ffp-contract=off";

    /// <summary>Splits a flag string at spaces (no quoting).</summary>
    public static IReadOnlyList<string> Split(string flags) =>
        flags.Split((char[])[' ', '\t', '\n'], StringSplitOptions.RemoveEmptyEntries);
}
