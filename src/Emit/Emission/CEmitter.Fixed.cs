using System.Globalization;
using System.Text;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

public sealed partial class CEmitter
{
    private static string CWeightType(WeightType w) => w.ToText() + "_t";

    /// <summary>The template model of a fixed-point scorer: every decision, number and comment of the C files.</summary>
    public static CFixedFileModel BuildFixedModel(FixedScorerPlan plan)
    {
        var f = plan.Fixed;
        var acc = plan.Accumulator;
        string name = plan.Options.Name, uname = Naming.MacroPrefix(name);
        string I(long v) => FixedText.CInt(v, acc);
        int e = plan.EnergyFractionBits;
        int maxCount = new[] { plan.Visible, plan.Hidden + 1, plan.PackedBytes, plan.LinkCount, plan.SelfTest.Count }.Max();
        bool general = plan.Model.Kind == ModelKind.General;
        bool hasHidden = plan.Hidden > 0;
        string boundName = uname + "_ERROR_BOUND";

        var visibleBias = new StringBuilder();
        for (int i = 0; i < plan.Visible; i++)
            visibleBias.Append("    ").Append(I(f.VisibleBias[i])).Append(", /* ").Append(TableText.UnitLabel(plan, i))
                .Append(" = ").Append(FixedText.Real(f.VisibleBias[i], e)).Append(" */\n");

        var hiddenBias = new StringBuilder();
        for (int j = 0; j < plan.Hidden; j++)
            hiddenBias.Append("    ").Append(I(f.Units[j].Bias)).Append(", /* hidden ").Append(TableText.Int(j)).Append(", ")
                .Append(f.Units[j].AccumulatorFormat.ToString()).Append(" = ").Append(FixedText.Real(f.Units[j].Bias, f.Units[j].FractionBits)).Append(" */\n");

        var fractionBits = TableText.Wrap(plan.UnitFractionBits.Select(x => TableText.Int(x)).ToArray(), 16, "    ");

        var weights = new StringBuilder();
        if (hasHidden)
            for (int i = 0; i < plan.Visible; i++)
            {
                weights.Append("    { /* ").Append(TableText.UnitLabel(plan, i)).Append(" */\n");
                var row = new string[plan.Hidden];
                for (int j = 0; j < plan.Hidden; j++) row[j] = TableText.Int(f.Weights[i * plan.Hidden + j]);
                TableText.Wrap(weights, row, 12, "        ");
                weights.Append("    },\n");
            }

        var linkWeights = new StringBuilder();
        for (int n = 0; n < plan.LinkCount; n++)
            linkWeights.Append("    ").Append(TableText.Int(plan.LinkWeight[n])).Append(", /* L(")
                .Append(TableText.Int(plan.LinkOther[n])).Append(", ").Append(TableText.Int(LinkHigher(plan, n))).Append(") = ")
                .Append(FixedText.Real(plan.LinkWeight[n], f.LateralFractionBits)).Append(" */\n");

        var pairs = new StringBuilder();
        if (general)
            for (int k = 0; k < plan.Hidden; k++)
            {
                pairs.Append("    { /* hidden ").Append(TableText.Int(k)).Append(" */\n");
                TableText.Wrap(pairs, Enumerable.Range(0, plan.Hidden).Select(l => I(plan.HiddenPairs[k * plan.Hidden + l])).ToArray(), 8, "        ");
                pairs.Append("    },\n");
            }

        var table = new StringBuilder();
        var entries = f.Table.Entries;
        const int perLine = 8;
        for (int k = 0; k < entries.Length; k += perLine)
        {
            int end = Math.Min(entries.Length, k + perLine);
            table.Append("   ");
            for (int n = k; n < end; n++) table.Append(' ').Append(TableText.Int(entries[n])).Append(',');
            string Node(int n) => f.Table.Node(n).ToString("R", CultureInfo.InvariantCulture);
            table.Append(end - 1 == k
                ? " /* T[" + TableText.Int(k) + "], d = " + Node(k) + " */\n"
                : " /* T[" + TableText.Int(k) + ".." + TableText.Int(end - 1) + "], d = " + Node(k) + " .. " + Node(end - 1) + " */\n");
        }

        var vectors = new StringBuilder();
        var expected = new StringBuilder();
        foreach (var c in plan.SelfTest)
        {
            vectors.Append("    { /* ").Append(c.Label).Append(" */\n");
            TableText.Wrap(vectors, c.Packed.Select(TableText.Hex).ToArray(), 12, "        ");
            vectors.Append("    },\n");
            expected.Append("    ").Append(I(c.ExactExpected!.Value)).Append(", /* ").Append(c.Label).Append(": ")
                .Append(FixedText.Real(c.ExactExpected.Value, e)).Append(" nats */\n");
        }

        var unitMacros = new StringBuilder();
        for (int i = 0; i < plan.UnitMacroNames.Count; i++)
            unitMacros.Append("#define ").Append(uname).Append("_UNIT_").Append(plan.UnitMacroNames[i]).Append(' ')
                .Append(TableText.Int(i)).Append(" /* ").Append(plan.UnitComments[i]).Append(" */\n");

        var typeChecks = new List<string>();
        var needed = new HashSet<string>(StringComparer.Ordinal);
        void Need(string macro, string type, string what)
        {
            if (!needed.Add(macro)) return;
            typeChecks.Add($"#ifndef {macro}");
            typeChecks.Add($"#error \"{name}.c needs {type} ({what}); this compiler's stdint.h has none\"");
            typeChecks.Add("#endif");
        }
        Need(acc == AccumulatorType.Int32 ? "INT32_MAX" : "INT64_MAX", acc.ToText() + "_t", "the accumulator type");
        if (hasHidden || plan.LinkCount > 0)
            Need(acc == AccumulatorType.Int32 ? "UINT32_MAX" : "UINT64_MAX", "u" + acc.ToText() + "_t", "shifts of the accumulator");
        if (hasHidden || plan.LinkCount > 0)
            Need(plan.WeightType switch { WeightType.Int8 => "INT8_MAX", WeightType.Int16 => "INT16_MAX", _ => "INT32_MAX" }, CWeightType(plan.WeightType), "the weight type");
        if (hasHidden && plan.TableEntriesUnsigned16) Need("UINT16_MAX", "uint16_t", "the softplus table");
        if (hasHidden && !plan.TableEntriesUnsigned16) Need("INT32_MAX", "int32_t", "the softplus table");
        if (hasHidden && plan.UniformFractionBits is null) Need("INT8_MAX", "int8_t", "the per-unit fraction bits");

        var banner = (string file) => "/*\n" + string.Concat(plan.BannerLines(file, "c").Select(l => " * " + l + "\n")) + " */";
        var result = plan.ResultRange;
        long accMax = acc.MaxMagnitude();
        long wMax = plan.WeightType.MaxMagnitude();
        string unitF = plan.UniformFractionBits is { } uf ? TableText.Int(uf) : $"(int){name}_fraction_bits[j]";
        string unitFk = plan.UniformFractionBits is { } ufk ? TableText.Int(ufk) : $"(int){name}_fraction_bits[k]";
        var unitFormats = FixedText.FormatList(f.Units.Select(u => u.AccumulatorFormat));
        var weightFormats = FixedText.FormatList(f.Units.Select(u => u.WeightFormat));

        return new CFixedFileModel
        {
            Name = name,
            UName = uname,
            HeaderBanner = banner(name + ".h"),
            SourceBanner = banner(name + ".c"),
            ModelId = CHeaderModel.ModelIdOf(plan.Model.Sha256),
            Mode = plan.Mode.ToText(),
            EnergyType = acc.ToText() + "_t",
            Visible = plan.Visible,
            Hidden = plan.Hidden,
            HasThreshold = plan.ThresholdUnits.HasValue,
            Threshold = plan.ThresholdUnits is { } t ? "((" + name + "_energy_t)" + FixedText.CMacroInt(t, acc) + ")" : "",
            ThresholdComment = plan.ThresholdUnits.HasValue ? FixedText.CCommentBody(FixedText.ThresholdLines(plan, boundName)) : "",
            ErrorBound = Literals.Upward(plan.ErrorBound, NumericMode.F64),
            SelfTestCount = plan.SelfTest.Count,
            HasUnitMacros = plan.UnitMacroNames.Count > 0,
            UnitMacros = Trim(unitMacros.ToString()),

            EnergyFractionBits = e,
            EnergyFormat = f.EnergyFormat.ToString(),
            EnergyScaleLiteral = Literals.Double(f.EnergyScale),
            FormatComment = FixedText.CCommentBody(FixedText.FormatLines(plan)),
            AccType = acc.ToText() + "_t",
            UAccType = "u" + acc.ToText() + "_t",
            WeightType = CWeightType(plan.WeightType),
            AccBits = plan.AccumulatorBits,
            AccMin = FixedText.CMacroInt(-accMax, acc),
            AccMax = FixedText.CMacroInt(accMax, acc),
            WeightBits = plan.WeightBits,
            WeightMin = FixedText.CMacroInt(-wMax, acc),
            WeightMax = FixedText.CMacroInt(wMax, acc),
            EnergyMin = FixedText.CMacroInt((long)result.Min, acc),
            EnergyMax = FixedText.CMacroInt((long)result.Max, acc),

            TypeChecks = typeChecks,
            IndexType = maxCount <= 0xFFFF ? "uint_fast16_t" : "uint_fast32_t",
            LinkStartType = plan.LinkCount <= 0xFFFF ? "uint16_t" : "uint32_t",
            LinkOtherType = plan.Visible <= 0x10000 ? "uint16_t" : "uint32_t",
            LastByteMask = "0x" + plan.LastByteMask.ToString("X2", CultureInfo.InvariantCulture) + "u",
            HasPartialByte = plan.LastByteMask != 0xFF,
            HasHidden = hasHidden,
            IsGeneral = general,
            HasLinks = plan.LinkCount > 0,
            LinkCount = plan.LinkCount,
            GroupRows = plan.GroupRows,
            RowBlocks = plan.Hidden >= FixedScorerPlan.RowBlock,
            RowRemainder = plan.Hidden % FixedScorerPlan.RowBlock != 0,
            NeedsToEnergy = plan.LinkCount > 0 || hasHidden,

            VisibleBiasRows = Trim(visibleBias.ToString()),
            HiddenFormatText = unitFormats,
            HiddenBiasRows = Trim(hiddenBias.ToString()),
            HasFractionBitsTable = hasHidden && plan.UniformFractionBits is null,
            FractionBitsFormats = FixedText.FractionBitsFormats(plan),
            FractionBitsRows = Trim(fractionBits),
            WeightFormatText = weightFormats,
            WeightRows = Trim(weights.ToString()),
            LateralFormat = f.LateralFormat.ToString(),
            LinkStartRows = Trim(TableText.Wrap(plan.LinkStart.Select(n => TableText.Int(n) + "u").ToArray(), 12, "    ")),
            LinkOtherRows = Trim(TableText.Wrap(plan.LinkOther.Select(n => TableText.Int(n) + "u").ToArray(), 12, "    ")),
            LinkWeightRows = Trim(linkWeights.ToString()),
            HiddenPairRows = Trim(pairs.ToString()),
            TableSegments = plan.TableSegments,
            TableStepText = "2^" + TableText.Int(-plan.TableStepBits),
            TableRangeText = f.Table.Range.ToString("R", CultureInfo.InvariantCulture),
            TableEntryFormat = f.Table.EntryFormat.ToString(),
            TableEntryType = plan.TableEntriesUnsigned16 ? "uint16_t" : "int32_t",
            TableRows = Trim(table.ToString()),

            TableStepBits = plan.TableStepBits,
            LseTableShift = f.LseTableShift,
            LateralShift = f.LateralShift,
            EnergyOffset = I(f.EnergyOffset),
            UnitFractionBitsOfJ = unitF,
            UnitFractionBitsOfK = unitFk,
            ToEnergyComment = plan.LinkCount > 0 || hasHidden ? FixedText.CComment(FixedText.ToEnergyLines(plan)) : "",
            LookupComment = hasHidden ? FixedText.CComment(FixedText.LookupLines(plan)) : "",
            SoftplusComment = hasHidden && !general ? FixedText.CComment(FixedText.SoftplusLines(plan)) : "",
            Lse2Comment = hasHidden && general ? FixedText.CComment(FixedText.Lse2Lines(plan)) : "",
            LogSumExpComment = hasHidden && general ? FixedText.CComment(FixedText.LogSumExpLines(plan)) : "",
            FreeEnergyComment = FixedText.CComment(FixedText.FreeEnergyLines(plan, boundName, rowsAtATime: 4)),

            SelfTestVectorRows = Trim(vectors.ToString()),
            SelfTestExpectedRows = Trim(expected.ToString()),
        };
    }

    /// <summary>The higher unit of link n in the walk order (the i with LinkStart[i] ≤ n &lt; LinkStart[i + 1]).</summary>
    private static int LinkHigher(ScorerPlan plan, int n)
    {
        int i = 0;
        while (plan.LinkStart[i + 1] <= n) i++;
        return i;
    }
}
