using Emit.Detection;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// What <c>emit compile</c> was asked for. <see cref="Name"/> must already be a valid C identifier
/// (see <see cref="Naming.CheckScorerName"/>). <see cref="TemplatesDirectory"/> is a folder whose
/// <c>c/</c> and <c>csharp/</c> sub-folders override shipped templates file by file. <see cref="Fixed"/> holds the
/// fixed-point choices (weights, accumulator, table size) and is used only with <see cref="NumericMode.Fixed"/>
/// (null there means the defaults). <see cref="Optimize"/> chooses the code layout (never the results).
/// <see cref="Stream"/> adds streamed scoring (a caller-owned state updated one flipped unit at a time) and
/// <see cref="Explain"/> adds explanations (the units whose flip lowers the free energy most), which implies the
/// streamed-scoring code; both are for kinds rbm and lateral (docs/generated-code.md).
/// <see cref="AlarmFilter"/>, when set, adds the K-of-N alarm filter beside the scorer (docs/generated-code.md).
/// </summary>
public sealed record CompileOptions(
    IReadOnlyList<string> Targets,
    NumericMode Numeric,
    string Name,
    string Namespace = CompileOptions.DefaultNamespace,
    int SelfTestVectors = CompileOptions.DefaultSelfTestVectors,
    string? TemplatesDirectory = null,
    FixedPointOptions? Fixed = null,
    OptimizeFor Optimize = OptimizeFor.Speed,
    bool Stream = false,
    bool Explain = false,
    AlarmFilterSpec? AlarmFilter = null)
{
    /// <summary>True when the streamed-scoring code is emitted (asked for, or needed by explanations).</summary>
    public bool EmitsStream => Stream || Explain;

    /// <summary>The fixed-point options in effect (the defaults when none were given).</summary>
    public FixedPointOptions FixedOptions => Fixed ?? new FixedPointOptions();

    /// <summary>Namespace of generated C# when none is given.</summary>
    public const string DefaultNamespace = "Emit.Generated";
    /// <summary>Self-test vectors compiled into the scorer when no count is given.</summary>
    public const int DefaultSelfTestVectors = 8;
    /// <summary>The most self-test vectors allowed (each is a table row in flash).</summary>
    public const int MaxSelfTestVectors = 4096;

    /// <summary>
    /// The options as they appear in every generated file's banner. Paths are left out (they differ between
    /// machines and would break byte-identical regeneration); a template override is noted as such.
    /// </summary>
    public string BannerText(string target)
    {
        var text = $"--target {target} --numeric {Numeric.ToText()}";
        if (Numeric == NumericMode.Fixed)
        {
            var f = FixedOptions;
            text += $" --weights {f.Weights.ToText()} --accumulator {(f.Accumulator is { } a ? a.ToText() : "auto")} " +
                $"--softplus-table {f.SoftplusTableSize.ToString(System.Globalization.CultureInfo.InvariantCulture)}";
            if (f.EnergyFractionBitsLimit is { } limit)
                text += " --energy-fraction-bits-limit " +
                        limit.ToString(System.Globalization.CultureInfo.InvariantCulture);
        }
        text += $" --name {Name}";
        if (target == "csharp") text += $" --namespace {Namespace}";
        text += $" --selftest-vectors {SelfTestVectors} --optimize {Optimize.ToText()}";
        if (Stream) text += " --stream";
        if (Explain) text += " --explain";
        if (AlarmFilter is not null) text += $" --alarm-filter {AlarmFilter}";
        if (TemplatesDirectory is not null) text += " --templates (custom)";
        return text;
    }
}
