namespace Emit;

/// <summary>
/// A setting a user chooses, named in library messages through <see cref="Settings.Ref"/> so each front end can name it
/// its own way: project files and the library API by its project-file key (<c>accumulator</c>), the command line by
/// its flag (<c>--accumulator</c>).
/// </summary>
public enum Setting
{
    /// <summary>Arithmetic of the generated scorer.</summary>
    Numeric,
    /// <summary>Fixed point: weight width.</summary>
    Weights,
    /// <summary>Fixed point: accumulator width.</summary>
    Accumulator,
    /// <summary>Fixed point: softplus table segments.</summary>
    SoftplusTable,
    /// <summary>Inputs embedded for the self-test.</summary>
    SelfTestVectors,
    /// <summary>Output languages or verification targets.</summary>
    Targets,
    /// <summary>Scorer name.</summary>
    Name,
    /// <summary>How log Z is computed.</summary>
    Method,
    /// <summary>Host C compiler.</summary>
    CCompiler,
    /// <summary>Replace files emit did not write.</summary>
    Force,
    /// <summary>Generated code: streamed scoring.</summary>
    Stream,
    /// <summary>Generated code: explanations.</summary>
    Explain,
}
