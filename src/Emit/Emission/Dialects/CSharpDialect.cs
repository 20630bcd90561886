using Emit.Quantize;

namespace Emit.Emission.Dialects;

/// <summary>
/// C#: one static class named in PascalCase (never equal to one of its members), unit constants in a nested class,
/// BCL types (<c>sbyte</c>, <c>short</c>, <c>int</c>, <c>long</c>), <c>L</c>-suffixed wide constants, <c>//</c>
/// comments.
/// </summary>
public sealed class CSharpDialect : TargetDialect
{
    /// <summary>Members of the generated class; the class name must differ from all of them.</summary>
    public static readonly IReadOnlySet<string> ClassMembers = new HashSet<string>(StringComparer.Ordinal)
    {
        "Visible", "Hidden", "PackedBytes", "EnergyScale", "Threshold", "ErrorBound", "ModelSha256", "SelfTestVectors",
        "FreeEnergy", "FreeEnergyUnits", "IsUnusual", "SelfTest", "Units", "Softplus", "HiddenWalk",
        "HiddenLogSumExp", "VisibleBiasTable", "HiddenBiasTable", "WeightTable", "LinkStartTable", "LinkOtherTable",
        "LinkWeightTable", "HiddenPairTable", "SelfTestInputTable", "SelfTestExpectedTable", "SelfTestToleranceTable",
        "EnergyFractionBits", "EnergyMin", "EnergyMax", "ToEnergy", "G", "Lse2", "FractionBitsTable", "SoftplusTable",
        "AddRow", "AddRows", "AlarmFilter", "FilterK", "FilterN",
    };

    /// <summary>Names the generated class uses itself, so unit constants avoid them.</summary>
    private static readonly string[] Reserved = ["Units"];

    private readonly IReadOnlyList<string> _units;

    /// <summary>The C# layout of <paramref name="plan"/>.</summary>
    public CSharpDialect(ScorerPlan plan) : base(plan)
    {
        ClassName = Naming.ClassName(plan.Options.Name, ClassMembers);
        _units = plan.UnitNames.Count > 0 ? Naming.UnitIdentifiers(plan.UnitNames, Reserved).CSharp : [];
    }

    /// <inheritdoc/>
    public override string Target => "csharp";

    /// <summary>The generated class.</summary>
    public string ClassName { get; }

    /// <summary>The namespace of the generated class.</summary>
    public string Namespace => Plan.Options.Namespace;

    /// <summary>The file name.</summary>
    public string FileName => Plan.Options.Name + ".cs";

    /// <inheritdoc/>
    public override IReadOnlyList<string> UnitIdentifiers => _units;

    /// <inheritdoc/>
    public override string AccType => Acc == AccumulatorType.Int32 ? "int" : "long";

    /// <inheritdoc/>
    public override string WeightType => ((FixedScorerPlan)Plan).WeightType switch
    {
        Quantize.WeightType.Int8 => "sbyte",
        Quantize.WeightType.Int16 => "short",
        _ => "int",
    };

    /// <inheritdoc/>
    public override string EntryType => ((FixedScorerPlan)Plan).TableEntriesUnsigned16 ? "ushort" : "int";

    /// <inheritdoc/>
    public override string IndexType => "int";

    /// <summary>The suffix that makes an integer literal the accumulator type (<c>L</c> for long).</summary>
    public string IntSuffix => Acc == AccumulatorType.Int64 ? "L" : "";

    /// <summary>The literal 1 of the accumulator type, for shifts (<c>1</c> or <c>1L</c>).</summary>
    public string One => "1" + IntSuffix;

    /// <summary>The math class of the float mode.</summary>
    public string MathType => Plan.Mode == NumericMode.F32 ? "global::System.MathF" : "global::System.Math";

    /// <summary>The last byte's mask as a C# literal.</summary>
    public string LastByteMask => "0x" + Plan.LastByteMask.ToString("X2", Inv) + "u";

    /// <summary>The summary line of the class.</summary>
    public string Summary
    {
        get
        {
            var text = $"Free energy of model {Naming.CommentText(Plan.ModelLabel)} (kind {Kind}, {Plan.Visible} " +
                "visible, " +
                       $"{Plan.Hidden} hidden units) in ";
            return Plan is FixedScorerPlan f
                ? text + $"fixed point ({f.WeightType.ToText()} weights, {f.Accumulator.ToText()} accumulator)."
                : text + Mode + ".";
        }
    }

    /// <summary>A C# integer constant of the accumulator type (<c>L</c> beyond the int range).</summary>
    public override string Int(long value) =>
        Acc == AccumulatorType.Int64 && (value < int.MinValue || value > int.MaxValue) ? value.ToString(Inv) +
        "L" : value.ToString(Inv);

    /// <inheritdoc/>
    public override string Index(long value) => value.ToString(Inv);

    /// <inheritdoc/>
    public override string Comment(IEnumerable<string> paragraphs, string indent) =>
        Prefixed(paragraphs, indent + "// ");
}
