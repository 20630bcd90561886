using Emit.Quantize;
using Scriban.Runtime;

namespace Emit.Emission.Dialects;

/// <summary>
/// C99: identifiers <c>NAME_…</c> and macros <c>UNAME_…</c>, <c>stdint.h</c> types, <c>INT64_C</c> for wide
/// constants, <c>u</c>-suffixed indices, <c>/* */</c> comments.
/// </summary>
public sealed class CDialect : TargetDialect
{
    /// <summary>Hidden units per block of the row additions when optimizing for speed (0: plain loops).</summary>
    /// <remarks>
    /// gcc at -O2 (its "very cheap" vectorizer) turns a fixed-length inner loop into full-width vector code, which a
    /// plain loop over a widening int8/int16 → int32 addition does not get (measured on bench/generated-c,
    /// docs/benchmarks.md).
    /// </remarks>
    public const int SpeedVectorBlock = 16;

    private readonly IReadOnlyList<string> _units;

    /// <summary>The C layout of <paramref name="plan"/>.</summary>
    public CDialect(ScorerPlan plan) : base(plan)
    {
        Name = plan.Options.Name;
        UName = Naming.MacroPrefix(Name);
        _units = plan.UnitNames.Count > 0 ? Naming.UnitIdentifiers(plan.UnitNames, []).C : [];
    }

    /// <inheritdoc/>
    public override string Target => "c";

    /// <summary>The scorer name: prefix of every function, type and table.</summary>
    public string Name { get; }

    /// <summary>The macro prefix.</summary>
    public string UName { get; }

    /// <summary>The header file name.</summary>
    public string HeaderFile => Name + ".h";

    /// <summary>The include guard.</summary>
    public string Guard => "EMIT_GENERATED_" + UName + "_H";

    /// <summary>
    /// The model identity the header and source compare at compile time: the SHA-256's first 32 bits.
    /// </summary>
    public string ModelId => "0x" + Plan.Model.Sha256[..8].ToUpperInvariant() + "u";

    /// <inheritdoc/>
    public override IReadOnlyList<string> UnitIdentifiers => _units;

    /// <inheritdoc/>
    public override string AccType => Acc.ToText() + "_t";

    /// <summary>The unsigned type of the accumulator's width.</summary>
    public string UAccType => "u" + Acc.ToText() + "_t";

    /// <inheritdoc/>
    public override string WeightType => ((FixedScorerPlan)Plan).WeightType.ToText() + "_t";

    /// <inheritdoc/>
    public override string EntryType => ((FixedScorerPlan)Plan).TableEntriesUnsigned16 ? "uint16_t" : "int32_t";

    /// <inheritdoc/>
    public override string IndexType => Plan.LargestCount <= 0xFFFF ? "uint_fast16_t" : "uint_fast32_t";

    /// <summary>Type of the link-start table.</summary>
    public string LinkStartType => Plan.LinkCount <= 0xFFFF ? "uint16_t" : "uint32_t";

    /// <summary>Type of the link-other table.</summary>
    public string LinkOtherType => Plan.Visible <= 0x10000 ? "uint16_t" : "uint32_t";

    /// <summary>The stdint.h types the fixed-point source needs, each with the macro that proves it exists.</summary>
    public IReadOnlyList<RequiredType> RequiredTypes
    {
        get
        {
            var plan = (FixedScorerPlan)Plan;
            var list = new List<RequiredType>();
            void Need(string macro, string type, string use)
            {
                if (list.All(t => t.Macro != macro)) list.Add(new RequiredType(macro, type, use));
            }
            bool wide = Acc == AccumulatorType.Int64;
            Need(wide ? "INT64_MAX" : "INT32_MAX", AccType, "the accumulator type");
            if (plan.HasHidden || plan.HasLinks)
            {
                Need(wide ? "UINT64_MAX" : "UINT32_MAX", UAccType, "shifts of the accumulator");
                Need(plan.WeightType switch { Quantize.WeightType.Int8 => "INT8_MAX",
                    Quantize.WeightType.Int16 => "INT16_MAX", _ => "INT32_MAX" }, WeightType, "the weight type");
            }
            if (plan.HasHidden)
                Need(plan.TableEntriesUnsigned16 ? "UINT16_MAX" : "INT32_MAX", EntryType, "the softplus table");
            if (plan.HasHidden && plan.UniformFractionBits is null)
                Need("INT8_MAX", "int8_t", "the per-unit fraction bits");
            return list;
        }
    }

    /// <summary>The last byte's mask as a C literal.</summary>
    public string LastByteMask => "0x" + Plan.LastByteMask.ToString("X2", Inv) + "u";

    /// <summary>Hidden units per block of the row additions (0: plain loops).</summary>
    public int VectorBlock =>
        Plan.Optimize == OptimizeFor.Speed && Plan.Hidden >= SpeedVectorBlock ? SpeedVectorBlock : 0;

    /// <summary>The math functions of the float mode (<c>expf</c> or <c>exp</c>...).</summary>
    public string Exp => Plan.Mode == NumericMode.F32 ? "expf" : "exp";

    /// <summary>The natural logarithm of the float mode.</summary>
    public string Log => Plan.Mode == NumericMode.F32 ? "logf" : "log";

    /// <summary>The absolute value of the float mode.</summary>
    public string Fabs => Plan.Mode == NumericMode.F32 ? "fabsf" : "fabs";

    /// <summary>
    /// A C integer constant of the accumulator type: plain decimal within int32, <c>INT64_C(n)</c> beyond it (the
    /// sign outside the macro), and the most negative value of the type as an expression.
    /// </summary>
    public override string Int(long value)
    {
        if (Acc == AccumulatorType.Int32 || (value >= -int.MaxValue && value <= int.MaxValue))
            return value == int.MinValue ? "(-2147483647 - 1)" : value.ToString(Inv);
        if (value == long.MinValue) return "(-INT64_C(9223372036854775807) - 1)";
        return value < 0 ? "-INT64_C(" + (-value).ToString(Inv) + ")" : "INT64_C(" + value.ToString(Inv) + ")";
    }

    /// <summary><see cref="Int"/> in parentheses when it starts with a sign (for macros).</summary>
    public string MacroInt(long value)
    {
        var s = Int(value);
        return s.StartsWith('-') ? "(" + s + ")" : s;
    }

    /// <inheritdoc/>
    public override string Index(long value) => value.ToString(Inv) + "u";

    /// <inheritdoc/>
    public override string Comment(IEnumerable<string> paragraphs, string indent) =>
        indent + "/*\n" + Prefixed(paragraphs, indent + " * ") + "\n" + indent + " */";

    /// <summary>Predicted footprint on the reference core of this mode (stated in the header).</summary>
    public ScorerFootprint Footprint => FootprintModel.Predict(Plan);

    /// <summary>The alarm filter's extra flash and RAM on the reference core (null without a filter).</summary>
    public FeatureFootprint? FilterFootprint => FootprintModel.Filter(Plan);

    /// <inheritdoc/>
    public override void Register(ScriptObject globals)
    {
        base.Register(globals);
        globals.Import("macro_int", new Func<long, string>(MacroInt));
    }
}
