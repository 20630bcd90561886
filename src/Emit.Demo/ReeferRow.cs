using System.Collections.Immutable;

namespace Emit.Demo;

/// <summary>
/// One generated status report: its flags (0/1 per <see cref="ReeferFlag"/>), the mode it was drawn in, and its fault
/// if any.
/// </summary>
public sealed record ReeferRow(ImmutableArray<byte> Flags, string Mode, string? Fault);
