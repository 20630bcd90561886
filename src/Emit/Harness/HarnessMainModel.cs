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

    /// <summary>True: inputs compiled into the image; false: read from standard input.</summary>
    public required bool Embedded { get; init; }

    /// <summary>Embedded: the number of input rows compiled in.</summary>
    public int VectorCount { get; init; }

    /// <summary>Embedded: the inputs as rows of the C table, one per line.</summary>
    public string VectorRows { get; init; } = "";
}
