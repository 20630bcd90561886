namespace Emit.Harness;

/// <summary>Template model of the C harness main (<c>templates/harness/main.c.sbn</c>).</summary>
public sealed class HarnessMainModel
{
    /// <summary>File name of the harness source.</summary>
    public required string FileName { get; init; }
    /// <summary>The scorer name, the prefix of its C functions.</summary>
    public required string Name { get; init; }
    /// <summary>The scorer name in upper case, the prefix of its C macros.</summary>
    public required string UName { get; init; }
    /// <summary>The generated header the harness includes.</summary>
    public required string HeaderFile { get; init; }
    /// <summary>Bytes of one free energy as the scorer returns it.</summary>
    public required int EnergyBytes { get; init; }
    /// <summary>True when the model has a threshold, so the harness also prints decisions.</summary>
    public required bool HasThreshold { get; init; }
    /// <summary>
    /// True when the visible count is not a multiple of eight (the last packed byte has unused bits).
    /// </summary>
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

    /// <summary>Embedded: the number of input rows compiled in.</summary>
    public int VectorCount { get; init; }

    /// <summary>Embedded: the inputs as rows of the C table, one per line.</summary>
    public string VectorRows { get; init; } = "";

    /// <summary>True: the harness runs a walk of flips through streamed scoring per input (<see cref="StreamWalk"/>).
    /// </summary>
    public bool Stream { get; init; }

    /// <summary>True: the harness asks for an explanation of each input.</summary>
    public bool Explain { get; init; }

    /// <summary>Flips of each walk (<see cref="StreamWalk.Steps"/>).</summary>
    public int StreamSteps { get; init; }

    /// <summary>The flip after which the stream is read first (<see cref="StreamWalk.FirstRead"/>).</summary>
    public int StreamFirstRead { get; init; }

    /// <summary>Units asked for per explanation (<see cref="StreamWalk.ExplainUnits"/>).</summary>
    public int ExplainUnits { get; init; } = StreamWalk.ExplainUnits;
}
