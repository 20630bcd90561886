namespace Emit.Emission;

/// <summary>A predicted footprint: flash (tables + code) and worst-case stack, in bytes.</summary>
public sealed record Footprint(long FlashBytes, long TableBytes, int CodeBytes, int StackBytes,
    int LibraryStackAllowance);
