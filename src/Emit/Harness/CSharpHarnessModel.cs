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

    /// <summary>The classifier run beside the scorer (each line gets <c>classify:IDX,HEX1,...</c>), or null.</summary>
    public ClassifierHarness? Classifier { get; init; }

    /// <summary>True when the class has the alarm filter: each line gets <c>filter:0|1</c>.</summary>
    public bool HasFilter { get; init; }
}
