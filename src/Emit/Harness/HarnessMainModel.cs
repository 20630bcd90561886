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

    /// <summary>True: inputs compiled into the image; false: read from standard input.</summary>
    public required bool Embedded { get; init; }

    public int VectorCount { get; init; }

    /// <summary>Embedded: the inputs as rows of the C table, one per line.</summary>
    public string VectorRows { get; init; } = "";

    /// <summary>True: the harness runs a walk of flips through streamed scoring per input (<see cref="StreamWalk"/>).
    /// </summary>
    public bool Stream { get; init; }

    /// <summary>True: the harness asks for an explanation of each input.</summary>
    public bool Explain { get; init; }

    public int StreamSteps { get; init; }

    public int StreamFirstRead { get; init; }

    public int ExplainUnits => StreamWalk.ExplainUnits;
}
