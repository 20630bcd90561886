using System.Text;
using Emit.Model;

namespace Emit.Emission;

/// <summary>C# target: one file <c>NAME.cs</c> holding a static class, BCL only, no allocation per call.</summary>
public sealed partial class CSharpEmitter : ITargetEmitter
{
    public const string FloatTemplate = "scorer-float.cs.sbn";
    public const string FixedTemplate = "scorer-fixed.cs.sbn";

    /// <summary>Members of the generated class; the class name must differ from all of them.</summary>
    public static readonly IReadOnlySet<string> ClassMembers = new HashSet<string>(StringComparer.Ordinal)
    {
        "Visible", "Hidden", "PackedBytes", "EnergyScale", "Threshold", "ErrorBound", "ModelSha256", "SelfTestVectors",
        "FreeEnergy", "FreeEnergyUnits", "IsUnusual", "SelfTest", "Units", "Softplus", "HiddenWalk",
        "HiddenLogSumExp", "VisibleBiasTable", "HiddenBiasTable", "WeightTable", "LinkStartTable", "LinkOtherTable",
        "LinkWeightTable", "HiddenPairTable", "SelfTestInputTable", "SelfTestExpectedTable", "SelfTestToleranceTable",
        "EnergyFractionBits", "EnergyMin", "EnergyMax", "ToEnergy", "G", "Lse2", "FractionBitsTable", "SoftplusTable",
    };

    public string Name => "csharp";
    public string Description => "C# static class (NAME.cs), BCL only";
    public IReadOnlyList<string> Extensions { get; } = [".cs"];
    public IReadOnlyList<string> TemplateFiles { get; } = [FloatTemplate, FixedTemplate];

    public IReadOnlyList<GeneratedFile> Emit(ScorerPlan scorer, TemplateRenderer templates)
    {
        templates.CheckOverrides(Name, TemplateFiles.ToArray());
        if (scorer is FixedScorerPlan fixedPlan)
        {
            var fixedModel = BuildFixedModel(fixedPlan);
            return [new GeneratedFile(fixedModel.FileName, templates.Render(Name, FixedTemplate, fixedModel))];
        }
        var plan = scorer as FloatScorerPlan
                   ?? throw new EmitException($"the {Name} target has no layout for {Setting.Numeric.Ref()} {scorer.Mode.ToText()}");
        var model = BuildModel(plan);
        return [new GeneratedFile(model.FileName, templates.Render(Name, FloatTemplate, model))];
    }

    private static string Trim(object text) => text.ToString()!.TrimEnd('\n');

    /// <summary>The template model: every decision and every number of the C# file.</summary>
    public static CSharpFileModel BuildModel(FloatScorerPlan plan)
    {
        var mode = plan.Mode;
        bool f32 = mode == NumericMode.F32;
        string L(double x) => Literals.Of(x, mode);
        const string indent = "            ";
        var fileName = plan.Options.Name + ".cs";

        var visibleBias = new StringBuilder();
        for (int i = 0; i < plan.Visible; i++)
            visibleBias.Append(indent).Append(L(plan.VisibleBias[i])).Append(", // ").Append(TableText.UnitLabel(plan, i)).Append('\n');

        var weights = new StringBuilder();
        if (plan.Hidden > 0)
            for (int i = 0; i < plan.Visible; i++)
            {
                weights.Append(indent).Append("// ").Append(TableText.UnitLabel(plan, i)).Append('\n');
                var row = new string[plan.Hidden];
                for (int j = 0; j < plan.Hidden; j++) row[j] = L(plan.Weights[i * plan.Hidden + j]);
                TableText.Wrap(weights, row, 6, indent);
            }

        var pairs = new StringBuilder();
        if (plan.Model.Kind == ModelKind.General)
            for (int k = 0; k < plan.Hidden; k++)
            {
                pairs.Append(indent).Append("// hidden ").Append(TableText.Int(k)).Append('\n');
                TableText.Wrap(pairs, Enumerable.Range(0, plan.Hidden).Select(l => L(plan.HiddenPairs[k * plan.Hidden + l])).ToArray(), 6, indent);
            }

        var vectors = new StringBuilder();
        var expected = new StringBuilder();
        var tolerance = new StringBuilder();
        foreach (var c in plan.SelfTest)
        {
            vectors.Append(indent).Append("// ").Append(c.Label).Append('\n');
            TableText.Wrap(vectors, c.Packed.Select(TableText.Hex).ToArray(), 12, indent);
            expected.Append(indent).Append(L(c.Expected)).Append(", // ").Append(c.Label).Append('\n');
            tolerance.Append(indent).Append(Literals.Upward(c.Tolerance, mode)).Append(", // ").Append(c.Label).Append('\n');
        }

        var units = new StringBuilder();
        for (int i = 0; i < plan.UnitConstantNames.Count; i++)
            units.Append(indent).Append("public const int ").Append(plan.UnitConstantNames[i]).Append(" = ").Append(TableText.Int(i))
                .Append("; // ").Append(plan.UnitComments[i]).Append('\n');

        int blockBits = plan.GrayBlockBits;
        var className = Naming.ClassName(plan.Options.Name, ClassMembers);
        return new CSharpFileModel
        {
            FileName = fileName,
            Banner = string.Concat(plan.BannerLines(fileName, "csharp").Select(l => "// " + l + "\n")).TrimEnd('\n'),
            Namespace = plan.Options.Namespace,
            ClassName = className,
            Summary = $"Free energy of model {Naming.CommentText(plan.ModelLabel).Replace("&", "&amp;", StringComparison.Ordinal).Replace("<", "&lt;", StringComparison.Ordinal).Replace(">", "&gt;", StringComparison.Ordinal)} " +
                      $"(kind {plan.Model.Kind.ToText()}, {plan.Visible} visible, {plan.Hidden} hidden units) in {mode.ToText()}.",
            ModelSha256 = plan.Model.Sha256,
            Mode = mode.ToText(),
            EnergyType = f32 ? "float" : "double",
            Zero = f32 ? "0.0f" : "0.0",
            One = f32 ? "1.0f" : "1.0",
            MathType = f32 ? "global::System.MathF" : "global::System.Math",
            Visible = plan.Visible,
            Hidden = plan.Hidden,
            PackedBytes = plan.PackedBytes,
            LastByteMask = "0x" + plan.LastByteMask.ToString("X2", System.Globalization.CultureInfo.InvariantCulture) + "u",
            HasPartialByte = plan.LastByteMask != 0xFF,
            HasHidden = plan.Hidden > 0,
            IsGeneral = plan.Model.Kind == ModelKind.General,
            HasLinks = plan.LinkCount > 0,
            HasThreshold = plan.Threshold.HasValue,
            Threshold = plan.Threshold is { } t ? L(t) : "",
            ErrorBound = Literals.Upward(plan.ErrorBound, NumericMode.F64),
            GrayBlockBits = blockBits,
            GrayBlockSize = 1 << blockBits,
            GrayBlocks = 1 << (plan.Hidden - blockBits),
            VisibleBiasRows = Trim(visibleBias),
            HiddenBiasRows = Trim(TableText.Wrap(plan.HiddenBias.Select(L).ToArray(), 6, indent)),
            WeightRows = Trim(weights),
            LinkStartRows = Trim(TableText.Wrap(plan.LinkStart.Select(n => TableText.Int(n)).ToArray(), 12, indent)),
            LinkOtherRows = Trim(TableText.Wrap(plan.LinkOther.Select(n => TableText.Int(n)).ToArray(), 12, indent)),
            LinkWeightRows = Trim(TableText.Wrap(plan.LinkWeight.Select(L).ToArray(), 6, indent)),
            HiddenPairRows = Trim(pairs),
            SelfTestCount = plan.SelfTest.Count,
            SelfTestVectorRows = Trim(vectors),
            SelfTestExpectedRows = Trim(expected),
            SelfTestToleranceRows = Trim(tolerance),
            HasUnitConstants = plan.UnitConstantNames.Count > 0,
            UnitConstants = Trim(units),
        };
    }
}
