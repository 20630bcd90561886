namespace Emit.Model;

/// <summary>A stored value of log Z with how it was obtained ("exact" or "ais") and its standard error.</summary>
public sealed record LogPartition(double Value, string Method, double Stderr);
