namespace Emit.Harness;

/// <summary>Template model of the C# harness program (<c>templates/harness/Program.cs.sbn</c>).</summary>
public sealed class CSharpHarnessModel
{
    /// <summary>File name of the generated C# scorer.</summary>
    public required string FileName { get; init; }
    /// <summary>Class name of the generated C# scorer.</summary>
    public required string ClassName { get; init; }

    /// <summary>The generated class as a fully qualified expression.</summary>
    public required string Class { get; init; }

    /// <summary>True when the model has a threshold, so the harness also prints decisions.</summary>
    public required bool HasThreshold { get; init; }

    /// <summary>True: the harness runs a walk of flips through streamed scoring per input (<see cref="StreamWalk"/>).
    /// </summary>
    public bool Stream { get; init; }

    /// <summary>True: the harness asks for an explanation of each input.</summary>
    public bool Explain { get; init; }

    /// <summary>The C# type of the scorer's result (float, double, int, long).</summary>
    public string EnergyType { get; init; } = "float";

    /// <summary>Flips of each walk (<see cref="StreamWalk.Steps"/>).</summary>
    public int StreamSteps { get; init; }

    /// <summary>The flip after which the stream is read first (<see cref="StreamWalk.FirstRead"/>).</summary>
    public int StreamFirstRead { get; init; }

    /// <summary>Units asked for per explanation (<see cref="StreamWalk.ExplainUnits"/>).</summary>
    public int ExplainUnits { get; init; } = StreamWalk.ExplainUnits;

    /// <summary>The classifier run beside the scorer (each line gets <c>classify:IDX,HEX1,...</c>), or null.</summary>
    public ClassifierHarness? Classifier { get; init; }

    /// <summary>True when the class has the alarm filter: each line gets <c>filter:0|1</c>.</summary>
    public bool HasFilter { get; init; }
}
