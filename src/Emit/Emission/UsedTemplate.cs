namespace Emit.Emission;

/// <summary>
/// A template that went into a generated file: its name (<c>TARGET/FILE.sbn</c>), where it was read from (the
/// override file's path, or the shipped resource name) and its text, so a manifest can record its hash.
/// </summary>
public sealed record UsedTemplate(string Name, string Source, string Text)
{
    /// <summary>True when the template came from a user's templates folder rather than the shipped set.</summary>
    public bool IsOverride => !Source.StartsWith("templates/", StringComparison.Ordinal);
}
