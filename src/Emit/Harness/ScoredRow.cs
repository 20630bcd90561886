namespace Emit.Harness;

/// <summary>
/// What a generated scorer returned for one input: the bits of its result (a float's bit pattern, or a fixed-point
/// integer in two's complement, zero-extended), whether the one-byte-per-unit entry point gave the same bits, and its
/// decision (1 unusual, 0 not, −1 when the scorer has no threshold). <see cref="Features"/> holds the rest of the
/// harness line: space-separated groups <c>NAME:FIELDS</c>, one per firmware feature checked on this input (FIELDS
/// never contain a space; each feature's check reads its own group with <see cref="Group"/>).
/// </summary>
public readonly record struct ScoredRow(ulong Bits, bool SameBits, sbyte Decision, string? Features = null)
{
    /// <summary>The FIELDS of the group <c>NAME:FIELDS</c> for <paramref name="name"/>, or null when the line has none.
    /// </summary>
    public string? Group(string name)
    {
        if (Features is null) return null;
        foreach (var word in Features.Split(' '))
            if (word.Length > name.Length && word[name.Length] == ':'
                && word.StartsWith(name, StringComparison.Ordinal))
                return word[(name.Length + 1)..];
        return null;
    }
}
