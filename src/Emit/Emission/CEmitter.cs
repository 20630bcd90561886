using System.Text;
using Emit.Model;

namespace Emit.Emission;

/// <summary>C99 target: <c>NAME.h</c> (API, configuration macros) and <c>NAME.c</c> (tables, scoring, self-test).</summary>
public sealed partial class CEmitter : ITargetEmitter
{
    public const string HeaderTemplate = "scorer.h.sbn";
    public const string FloatSourceTemplate = "scorer-float.c.sbn";
    public const string FixedSourceTemplate = "scorer-fixed.c.sbn";

    public string Name => "c";
    public string Description => "C99 header and source (NAME.h, NAME.c), stdint.h only";
    public IReadOnlyList<string> Extensions { get; } = [".h", ".c"];
    public IReadOnlyList<string> TemplateFiles { get; } = [HeaderTemplate, FloatSourceTemplate, FixedSourceTemplate];

    public IReadOnlyList<GeneratedFile> Emit(ScorerPlan scorer, TemplateRenderer templates)
    {
        templates.CheckOverrides(Name, TemplateFiles.ToArray());
        if (scorer is FixedScorerPlan fixedPlan)
        {
            var fixedModel = BuildFixedModel(fixedPlan);
            return
            [
                new GeneratedFile(fixedModel.HeaderFile, templates.Render(Name, HeaderTemplate, fixedModel)),
                new GeneratedFile(fixedPlan.Options.Name + ".c", templates.Render(Name, FixedSourceTemplate, fixedModel)),
            ];
        }
        var plan = scorer as FloatScorerPlan
                   ?? throw new EmitException($"the {Name} target has no layout for {Setting.Numeric.Ref()} {scorer.Mode.ToText()}");
        var model = BuildModel(plan);
        return
        [
            new GeneratedFile(model.HeaderFile, templates.Render(Name, HeaderTemplate, model)),
            new GeneratedFile(plan.Options.Name + ".c", templates.Render(Name, FloatSourceTemplate, model)),
        ];
    }

    private static string Trim(object text) => text.ToString()!.TrimEnd('\n');

    /// <summary>The template model: every decision and every number of the C files.</summary>
    public static CFileModel BuildModel(FloatScorerPlan plan)
    {
        var mode = plan.Mode;
        bool f32 = mode == NumericMode.F32;
        string name = plan.Options.Name, uname = Naming.MacroPrefix(name);
        string L(double x) => Literals.Of(x, mode);
        int maxCount = new[] { plan.Visible, plan.Hidden + 1, plan.PackedBytes, plan.LinkCount, plan.SelfTest.Count }.Max();

        var visibleBias = new StringBuilder();
        for (int i = 0; i < plan.Visible; i++)
            visibleBias.Append("    ").Append(L(plan.VisibleBias[i])).Append(", /* ").Append(TableText.UnitLabel(plan, i)).Append(" */\n");

        var weights = new StringBuilder();
        if (plan.Hidden > 0)
            for (int i = 0; i < plan.Visible; i++)
            {
                weights.Append("    { /* ").Append(TableText.UnitLabel(plan, i)).Append(" */\n");
                var row = new string[plan.Hidden];
                for (int j = 0; j < plan.Hidden; j++) row[j] = L(plan.Weights[i * plan.Hidden + j]);
                TableText.Wrap(weights, row, 6, "        ");
                weights.Append("    },\n");
            }

        var pairs = new StringBuilder();
        if (plan.Model.Kind == ModelKind.General)
            for (int k = 0; k < plan.Hidden; k++)
            {
                pairs.Append("    { /* hidden ").Append(TableText.Int(k)).Append(" */\n");
                TableText.Wrap(pairs, Enumerable.Range(0, plan.Hidden).Select(l => L(plan.HiddenPairs[k * plan.Hidden + l])).ToArray(), 6, "        ");
                pairs.Append("    },\n");
            }

        var vectors = new StringBuilder();
        foreach (var c in plan.SelfTest)
        {
            vectors.Append("    { /* ").Append(c.Label).Append(" */\n");
            TableText.Wrap(vectors, c.Packed.Select(TableText.Hex).ToArray(), 12, "        ");
            vectors.Append("    },\n");
        }
        var expected = new StringBuilder();
        var tolerance = new StringBuilder();
        foreach (var c in plan.SelfTest)
        {
            expected.Append("    ").Append(L(c.Expected)).Append(", /* ").Append(c.Label).Append(" */\n");
            tolerance.Append("    ").Append(Literals.Upward(c.Tolerance, mode)).Append(", /* ").Append(c.Label).Append(" */\n");
        }

        var unitMacros = new StringBuilder();
        for (int i = 0; i < plan.UnitMacroNames.Count; i++)
            unitMacros.Append("#define ").Append(uname).Append("_UNIT_").Append(plan.UnitMacroNames[i]).Append(' ')
                .Append(TableText.Int(i)).Append(" /* ").Append(plan.UnitComments[i]).Append(" */\n");

        var banner = (string file) => "/*\n" + string.Concat(plan.BannerLines(file, "c").Select(l => " * " + l + "\n")) + " */";
        string threshold = plan.Threshold is { } t ? L(t) : "";
        if (threshold.StartsWith('-')) threshold = "(" + threshold + ")";
        int blockBits = plan.GrayBlockBits;

        return new CFileModel
        {
            Name = name,
            UName = uname,
            HeaderBanner = banner(name + ".h"),
            SourceBanner = banner(name + ".c"),
            ModelId = CHeaderModel.ModelIdOf(plan.Model.Sha256),
            Mode = mode.ToText(),
            IsF32 = f32,
            EnergyType = f32 ? "float" : "double",
            Zero = f32 ? "0.0f" : "0.0",
            One = f32 ? "1.0f" : "1.0",
            Exp = f32 ? "expf" : "exp",
            Log = f32 ? "logf" : "log",
            Fabs = f32 ? "fabsf" : "fabs",
            IndexType = maxCount <= 0xFFFF ? "uint_fast16_t" : "uint_fast32_t",
            LinkStartType = plan.LinkCount <= 0xFFFF ? "uint16_t" : "uint32_t",
            LinkOtherType = plan.Visible <= 0x10000 ? "uint16_t" : "uint32_t",
            Visible = plan.Visible,
            Hidden = plan.Hidden,
            LastByteMask = "0x" + plan.LastByteMask.ToString("X2", System.Globalization.CultureInfo.InvariantCulture) + "u",
            HasPartialByte = plan.LastByteMask != 0xFF,
            HasHidden = plan.Hidden > 0,
            IsGeneral = plan.Model.Kind == ModelKind.General,
            HasLinks = plan.LinkCount > 0,
            LinkCount = plan.LinkCount,
            HasThreshold = plan.Threshold.HasValue,
            Threshold = threshold,
            ErrorBound = Literals.Upward(plan.ErrorBound, NumericMode.F64),
            GrayBlockBits = blockBits,
            GrayBlockSize = TableText.Int(1L << blockBits) + "u",
            GrayBlockStates = 1 << blockBits,
            GrayBlocks = TableText.Int(1L << (plan.Hidden - blockBits)) + "u",
            VisibleBiasRows = Trim(visibleBias.ToString()),
            HiddenBiasRows = Trim(TableText.Wrap(plan.HiddenBias.Select(L).ToArray(), 6, "    ")),
            WeightRows = Trim(weights.ToString()),
            LinkStartRows = Trim(TableText.Wrap(plan.LinkStart.Select(n => TableText.Int(n) + "u").ToArray(), 12, "    ")),
            LinkOtherRows = Trim(TableText.Wrap(plan.LinkOther.Select(n => TableText.Int(n) + "u").ToArray(), 12, "    ")),
            LinkWeightRows = Trim(TableText.Wrap(plan.LinkWeight.Select(L).ToArray(), 6, "    ")),
            HiddenPairRows = Trim(pairs.ToString()),
            SelfTestCount = plan.SelfTest.Count,
            SelfTestVectorRows = Trim(vectors.ToString()),
            SelfTestExpectedRows = Trim(expected.ToString()),
            SelfTestToleranceRows = Trim(tolerance.ToString()),
            HasUnitMacros = plan.UnitMacroNames.Count > 0,
            UnitMacros = Trim(unitMacros.ToString()),
        };
    }
}
