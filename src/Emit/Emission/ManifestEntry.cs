namespace Emit.Emission;

/// <summary>
/// One generated file as the manifest lists it: its target, its name (no folder), and its SHA-256 and size in bytes.
/// </summary>
public sealed record ManifestEntry(string Target, string File, string Sha256, long Bytes);
