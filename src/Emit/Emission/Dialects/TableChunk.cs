namespace Emit.Emission.Dialects;

/// <summary>
/// One line of a table with a review comment: entries <see cref="First"/>..<see cref="Last"/> and their nodes.
/// </summary>
public sealed record TableChunk(IReadOnlyList<long> Values, int First, int Last, string FirstNode, string LastNode);
