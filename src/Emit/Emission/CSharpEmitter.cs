using Emit.Emission.Dialects;

namespace Emit.Emission;

/// <summary>C# target: one file <c>NAME.cs</c> holding a static class, BCL only, no allocation per call.</summary>
public sealed class CSharpEmitter : ITargetEmitter
{
    public const string FloatTemplate = "scorer-float.cs.sbn";
    public const string FixedTemplate = "scorer-fixed.cs.sbn";
    public const string CommonTemplate = "common.cs.sbn";
    public const string LicenceTemplate = "licence.sbn";
    public const string FilterTemplate = "filter.cs.sbn";

    public string Name => "csharp";
    public string Description => "C# static class (NAME.cs), BCL only";
    public IReadOnlyList<string> Extensions { get; } = [".cs"];
    public IReadOnlyList<string> TemplateFiles { get; } = [FloatTemplate, FixedTemplate, CommonTemplate, LicenceTemplate, FilterTemplate,
        ClassifierEmitter.CSharpTemplate];

    public IReadOnlyList<GeneratedFile> Emit(ScorerPlan plan, TemplateRenderer templates)
    {
        templates.CheckOverrides(Name, TemplateFiles.ToArray());
        var d = new CSharpDialect(plan);
        var (text, used) = templates.Render(Name, plan is FixedScorerPlan ? FixedTemplate : FloatTemplate, globals =>
        {
            d.Register(globals);
            globals.SetValue("file", d.FileName, readOnly: true);
            globals.SetValue("x", plan is FixedScorerPlan f ? new FixedComments(f, d, "ErrorBound") : null, readOnly: true);
        });
        return [new GeneratedFile(d.FileName, text, used)];
    }
}
