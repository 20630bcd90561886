namespace Emit.Emission;

/// <summary>
/// What a generated C scorer costs on its mode's reference core, as the header states it: predicted flash (code +
/// tables) and worst-case stack in bytes, the reference core and compiler, and the run-time dependencies.
/// </summary>
public sealed record ScorerFootprint(string Reference, Footprint Figures, IReadOnlyList<string> LibmFunctions)
{
    /// <summary>Predicted flash bytes (code and tables).</summary>
    public long FlashBytes => Figures.FlashBytes;

    /// <summary>Predicted worst-case stack bytes.</summary>
    public int StackBytes => Figures.StackBytes;

    /// <summary>The library functions a compiler may call for copies and fills.</summary>
    public static IReadOnlyList<string> MemoryFunctions { get; } = ["memcpy", "memset"];

    /// <summary>The header's paragraphs stating the figures and the dependencies.</summary>
    public IReadOnlyList<string> Statement =>
    [
        $"Predicted cost on {Reference}: flash {FlashBytes} bytes ({Figures.CodeBytes} code + {Figures.TableBytes} " +
            "tables), " +
        $"worst-case stack {StackBytes} bytes (including {Figures.LibraryStackAllowance} for library calls). " +
        "Estimates from emit's footprint model (docs/generated-code.md, \"Costs\"), checked in emit's tests against " +
        "arm-none-eabi-size and -fstack-usage.",
        LibmFunctions.Count == 0
            ? "Run-time dependencies: no libm function; a compiler may emit calls to memcpy and memset."
            : $"Run-time dependencies: {string.Join(", ", LibmFunctions)} from the C maths library (link with -lm " +
            "where it is " +
              "separate); a compiler may emit calls to memcpy and memset.",
    ];
}
