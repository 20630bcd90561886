namespace Emit.Cli;

/// <summary>How <c>emit logz</c> computes log Z.</summary>
public enum LogZMethod
{
    /// <summary>Enumeration of every state (docs/model-format.md).</summary>
    Exact,
    /// <summary>Annealed importance sampling, for models too large to enumerate.</summary>
    Ais,
}
