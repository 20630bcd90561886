namespace Emit.Harness;

/// <summary>Template model of the Cortex-M3 start-up code and linker script.</summary>
public sealed class StartupModel
{
    /// <summary>File name of the generated file.</summary>
    public required string FileName { get; init; }

    /// <summary>qemu's exit status when the image faults.</summary>
    public required int FaultStatus { get; init; }
}
