namespace Emit.Harness;

/// <summary>Template model of the C# harness program (<c>templates/harness/Program.cs.sbn</c>).</summary>
public sealed class CSharpHarnessModel
{
    public required string FileName { get; init; }
    public required string ClassName { get; init; }

    /// <summary>The generated class as a fully qualified expression.</summary>
    public required string Class { get; init; }

    public required bool HasThreshold { get; init; }

    /// <summary>True: the harness runs a walk of flips through streamed scoring per input (<see cref="StreamWalk"/>).
    /// </summary>
    public bool Stream { get; init; }

    /// <summary>True: the harness asks for an explanation of each input.</summary>
    public bool Explain { get; init; }

    /// <summary>The C# type of the scorer's result (float, double, int, long).</summary>
    public string EnergyType { get; init; } = "float";

    public int StreamSteps { get; init; }

    public int StreamFirstRead { get; init; }

    public int ExplainUnits => StreamWalk.ExplainUnits;
}
