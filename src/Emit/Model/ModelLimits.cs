namespace Emit.Model;

/// <summary>Sizes beyond which a model is refused before any memory is allocated for it.</summary>
public static class ModelLimits
{
    /// <summary>Most units in one layer.</summary>
    public const int MaxUnits = 1 << 20;

    /// <summary>Most visible × hidden weights (2^27 doubles = 1 GiB).</summary>
    public const long MaxWeights = 1L << 27;

    /// <summary>Most lateral links in one layer.</summary>
    public const long MaxLinks = 1L << 24;
}
