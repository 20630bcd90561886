namespace Emit.Emission;

/// <summary>
/// One template a compilation read: the target it belongs to, its file name under <c>templates/TARGET/</c>, whether
/// it came from the user's templates folder (<see cref="Custom"/>) or was shipped inside emit, and the SHA-256 of its
/// bytes.
/// </summary>
public sealed record TemplateUse(string Target, string File, bool Custom, string Sha256);
