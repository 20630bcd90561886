namespace Emit.Emission.Dialects;

/// <summary>
/// A type the generated C needs from stdint.h, the macro whose presence proves it, and what it is used for.
/// </summary>
public sealed record RequiredType(string Macro, string Type, string Use);
