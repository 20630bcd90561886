using System.Globalization;
using System.Text;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

public sealed partial class CSharpEmitter
{
    private static string CsWeightType(WeightType w) => w switch
    {
        WeightType.Int8 => "sbyte",
        WeightType.Int16 => "short",
        _ => "int",
    };

    /// <summary>The template model of a fixed-point scorer: every decision, number and comment of the C# file.</summary>
    public static CSharpFixedFileModel BuildFixedModel(FixedScorerPlan plan)
    {
        var f = plan.Fixed;
        var acc = plan.Accumulator;
        string I(long v) => FixedText.CsInt(v, acc);
        const string indent = "            ";
        const string memberIndent = "        ";
        int e = plan.EnergyFractionBits;
        bool general = plan.Model.Kind == ModelKind.General;
        bool hasHidden = plan.Hidden > 0;
        var fileName = plan.Options.Name + ".cs";
        string accType = acc == AccumulatorType.Int32 ? "int" : "long";

        var visibleBias = new StringBuilder();
        for (int i = 0; i < plan.Visible; i++)
            visibleBias.Append(indent).Append(I(f.VisibleBias[i])).Append(", // ").Append(TableText.UnitLabel(plan, i))
                .Append(" = ").Append(FixedText.Real(f.VisibleBias[i], e)).Append('\n');

        var hiddenBias = new StringBuilder();
        for (int j = 0; j < plan.Hidden; j++)
            hiddenBias.Append(indent).Append(I(f.Units[j].Bias)).Append(", // hidden ").Append(TableText.Int(j)).Append(", ")
                .Append(f.Units[j].AccumulatorFormat.ToString()).Append(" = ").Append(FixedText.Real(f.Units[j].Bias, f.Units[j].FractionBits)).Append('\n');

        var weights = new StringBuilder();
        if (hasHidden)
            for (int i = 0; i < plan.Visible; i++)
            {
                weights.Append(indent).Append("// ").Append(TableText.UnitLabel(plan, i)).Append('\n');
                var row = new string[plan.Hidden];
                for (int j = 0; j < plan.Hidden; j++) row[j] = TableText.Int(f.Weights[i * plan.Hidden + j]);
                TableText.Wrap(weights, row, 12, indent);
            }

        var table = new StringBuilder();
        var entries = f.Table.Entries;
        for (int k = 0; k < entries.Length; k += 8)
        {
            int end = Math.Min(entries.Length, k + 8);
            table.Append(indent[..^1]);
            for (int n = k; n < end; n++) table.Append(' ').Append(TableText.Int(entries[n])).Append(',');
            table.Append(end - 1 == k ? " // T[" + TableText.Int(k) + "]\n" : " // T[" + TableText.Int(k) + ".." + TableText.Int(end - 1) + "]\n");
        }

        var linkWeights = new StringBuilder();
        for (int n = 0; n < plan.LinkCount; n++)
            linkWeights.Append(indent).Append(TableText.Int(plan.LinkWeight[n])).Append(", // ")
                .Append(FixedText.Real(plan.LinkWeight[n], f.LateralFractionBits)).Append('\n');

        var pairs = new StringBuilder();
        if (general)
            for (int k = 0; k < plan.Hidden; k++)
            {
                pairs.Append(indent).Append("// hidden ").Append(TableText.Int(k)).Append('\n');
                TableText.Wrap(pairs, Enumerable.Range(0, plan.Hidden).Select(l => I(plan.HiddenPairs[k * plan.Hidden + l])).ToArray(), 8, indent);
            }

        var vectors = new StringBuilder();
        var expected = new StringBuilder();
        foreach (var c in plan.SelfTest)
        {
            vectors.Append(indent).Append("// ").Append(c.Label).Append('\n');
            TableText.Wrap(vectors, c.Packed.Select(TableText.Hex).ToArray(), 12, indent);
            expected.Append(indent).Append(I(c.ExactExpected!.Value)).Append(", // ").Append(c.Label).Append(": ")
                .Append(FixedText.Real(c.ExactExpected.Value, e)).Append(" nats\n");
        }

        var units = new StringBuilder();
        for (int i = 0; i < plan.UnitConstantNames.Count; i++)
            units.Append(indent).Append("public const int ").Append(plan.UnitConstantNames[i]).Append(" = ").Append(TableText.Int(i))
                .Append("; // ").Append(plan.UnitComments[i]).Append('\n');

        string Xml(string text) => text.Replace("&", "&amp;", StringComparison.Ordinal).Replace("<", "&lt;", StringComparison.Ordinal).Replace(">", "&gt;", StringComparison.Ordinal);
        var className = Naming.ClassName(plan.Options.Name, ClassMembers);
        var result = plan.ResultRange;
        string C(IEnumerable<string> lines) => FixedText.CsComment(lines, memberIndent);
        return new CSharpFixedFileModel
        {
            FileName = fileName,
            Banner = string.Concat(plan.BannerLines(fileName, "csharp").Select(l => "// " + l + "\n")).TrimEnd('\n'),
            Namespace = plan.Options.Namespace,
            ClassName = className,
            Summary = $"Free energy of model {Xml(Naming.CommentText(plan.ModelLabel))} " +
                      $"(kind {plan.Model.Kind.ToText()}, {plan.Visible} visible, {plan.Hidden} hidden units) in fixed point " +
                      $"({plan.WeightType.ToText()} weights, {acc.ToText()} accumulator).",
            ModelSha256 = plan.Model.Sha256,

            AccType = accType,
            WeightType = CsWeightType(plan.WeightType),
            TableEntryType = plan.TableEntriesUnsigned16 ? "ushort" : "int",
            EnergyFormat = f.EnergyFormat.ToString(),
            EnergyFractionBits = e,
            EnergyScaleLiteral = Literals.Double(f.EnergyScale),
            EnergyMin = I((long)result.Min),
            EnergyMax = I((long)result.Max),

            Visible = plan.Visible,
            Hidden = plan.Hidden,
            PackedBytes = plan.PackedBytes,
            LastByteMask = "0x" + plan.LastByteMask.ToString("X2", CultureInfo.InvariantCulture) + "u",
            HasPartialByte = plan.LastByteMask != 0xFF,
            HasHidden = hasHidden,
            IsGeneral = general,
            HasLinks = plan.LinkCount > 0,
            PairRows = plan.PairRows,
            NeedsToEnergy = plan.LinkCount > 0 || hasHidden,
            HasFractionBitsTable = hasHidden && plan.UniformFractionBits is null,

            HasThreshold = plan.ThresholdUnits.HasValue,
            Threshold = plan.ThresholdUnits is { } t ? I(t) : "",
            ThresholdComment = plan.ThresholdUnits.HasValue
                ? string.Join("\n", FixedText.Wrap(FixedText.ThresholdLines(plan, "ErrorBound")).Select(l => memberIndent + "/// " + Xml(l)))
                : "",
            ErrorBound = Literals.Upward(plan.ErrorBound, NumericMode.F64),

            TableSegments = plan.TableSegments,
            TableStepBits = plan.TableStepBits,
            TableStepText = "2^" + TableText.Int(-plan.TableStepBits),
            TableEntryFormat = f.Table.EntryFormat.ToString(),
            LseTableShift = f.LseTableShift,
            LateralShift = f.LateralShift,
            LateralFormat = f.LateralFormat.ToString(),
            EnergyOffset = I(f.EnergyOffset),
            UnitFractionBitsOfJ = plan.UniformFractionBits is { } uf ? TableText.Int(uf) : "fractionBits[j]",
            UnitFractionBitsOfK = plan.UniformFractionBits is { } ufk ? TableText.Int(ufk) : "fractionBits[k]",
            HiddenFormatText = hasHidden ? FixedText.FormatList(f.Units.Select(u => u.AccumulatorFormat)) : "",
            FractionBitsFormats = FixedText.FractionBitsFormats(plan),
            WeightFormatText = hasHidden ? FixedText.FormatList(f.Units.Select(u => u.WeightFormat)) : "",

            FormatComment = C(FixedText.FormatLines(plan)),
            FreeEnergyComment = C(FixedText.FreeEnergyLines(plan, "ErrorBound")),
            ToEnergyComment = plan.LinkCount > 0 || hasHidden ? C(FixedText.ToEnergyLines(plan)) : "",
            LookupComment = hasHidden ? C(FixedText.LookupLines(plan)) : "",
            SoftplusComment = hasHidden && !general ? C(FixedText.SoftplusLines(plan)) : "",
            Lse2Comment = hasHidden && general ? C(FixedText.Lse2Lines(plan)) : "",
            LogSumExpComment = hasHidden && general ? C(FixedText.LogSumExpLines(plan)) : "",

            VisibleBiasRows = Trim(visibleBias),
            HiddenBiasRows = Trim(hiddenBias),
            FractionBitsRows = Trim(TableText.Wrap(plan.UnitFractionBits.Select(x => TableText.Int(x)).ToArray(), 16, indent)),
            WeightRows = Trim(weights),
            TableRows = Trim(table),
            LinkStartRows = Trim(TableText.Wrap(plan.LinkStart.Select(n => TableText.Int(n)).ToArray(), 12, indent)),
            LinkOtherRows = Trim(TableText.Wrap(plan.LinkOther.Select(n => TableText.Int(n)).ToArray(), 12, indent)),
            LinkWeightRows = Trim(linkWeights),
            HiddenPairRows = Trim(pairs),

            SelfTestCount = plan.SelfTest.Count,
            SelfTestVectorRows = Trim(vectors),
            SelfTestExpectedRows = Trim(expected),
            HasUnitConstants = plan.UnitConstantNames.Count > 0,
            UnitConstants = Trim(units),
        };
    }
}
