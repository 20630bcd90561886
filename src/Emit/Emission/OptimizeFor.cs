namespace Emit.Emission;

/// <summary>
/// What generated code is laid out for. Both give bit-identical results: only the grouping of integer additions
/// that cannot overflow, and the loop structure, differ (docs/generated-code.md, "Optimization").
/// </summary>
public enum OptimizeFor
{
    /// <summary>
    /// Weight rows added four at a time, inner loops in fixed-length blocks that compilers vectorize.
    /// </summary>
    Speed,

    /// <summary>One row at a time in plain loops: the least code, for flash-limited parts such as Cortex-M0.</summary>
    Size,
}

/// <summary>
/// Text forms of <see cref="OptimizeFor"/> as used on the command line, in project files and banners.
/// </summary>
public static class OptimizeForNames
{
    /// <summary>"speed" or "size".</summary>
    public static string ToText(this OptimizeFor value) => value switch
    {
        OptimizeFor.Speed => "speed",
        OptimizeFor.Size => "size",
        _ => throw new ArgumentOutOfRangeException(nameof(value)),
    };

    /// <summary>The value named by <paramref name="text"/>, or null.</summary>
    public static OptimizeFor? Parse(string text) => text switch
    {
        "speed" => OptimizeFor.Speed,
        "size" => OptimizeFor.Size,
        _ => null,
    };
}
