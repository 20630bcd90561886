namespace Emit.Harness;

/// <summary>Template model of the C harness main (<c>templates/harness/main.c.sbn</c>).</summary>
public sealed class HarnessMainModel
{
    public required string FileName { get; init; }
    public required string Name { get; init; }
    public required string UName { get; init; }
    public required string HeaderFile { get; init; }
    public required int EnergyBytes { get; init; }
    public required bool HasThreshold { get; init; }
    public required bool HasPartialByte { get; init; }

    /// <summary>The unused high bits of the last packed byte, as a C constant ("0xE0u").</summary>
    public required string UnusedBitsMask { get; init; }

    /// <summary>The classifier run beside the scorer (each line gets <c>classify:IDX,HEX1,...</c>), or null.</summary>
    public ClassifierHarness? Classifier { get; init; }

    /// <summary>True when the sources have the alarm filter: each line gets <c>filter:0|1</c>.</summary>
    public bool HasFilter { get; init; }

    /// <summary>
    /// Embedded with the filter: the decisions of earlier images fed to the filter before the first input (C
    /// initialiser items, "0" when there are none; at most N − 1 matter, so the state runs on across images).
    /// </summary>
    public string FilterWarmup { get; init; } = "0";

    /// <summary>How many of <see cref="FilterWarmup"/>'s items are decisions.</summary>
    public int FilterWarmupCount { get; init; }

    /// <summary>True: inputs compiled into the image; false: read from standard input.</summary>
    public required bool Embedded { get; init; }

    public int VectorCount { get; init; }

    /// <summary>Embedded: the inputs as rows of the C table, one per line.</summary>
    public string VectorRows { get; init; } = "";
}
