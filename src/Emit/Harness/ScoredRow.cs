namespace Emit.Harness;

/// <summary>
/// What a generated scorer returned for one input: the bits of its result (a float's bit pattern, or a fixed-point
/// integer in two's complement, zero-extended), whether the one-byte-per-unit entry point gave the same bits, and its
/// decision (1 unusual, 0 not, −1 when the scorer has no threshold).
/// </summary>
public readonly record struct ScoredRow(ulong Bits, bool SameBits, sbyte Decision);
