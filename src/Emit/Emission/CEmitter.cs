using Emit.Emission.Dialects;

namespace Emit.Emission;

/// <summary>C99 target: <c>NAME.h</c> (API, configuration macros) and <c>NAME.c</c> (tables, scoring, self-test).</summary>
public sealed class CEmitter : ITargetEmitter
{
    public const string HeaderTemplate = "scorer.h.sbn";
    public const string FloatSourceTemplate = "scorer-float.c.sbn";
    public const string FixedSourceTemplate = "scorer-fixed.c.sbn";
    public const string CommonTemplate = "common.c.sbn";
    public const string LicenceTemplate = "licence.sbn";
    public const string FilterHeaderTemplate = "filter.h.sbn";
    public const string FilterSourceTemplate = "filter.c.sbn";

    public string Name => "c";
    public string Description => "C99 header and source (NAME.h, NAME.c), stdint.h only";
    public IReadOnlyList<string> Extensions { get; } = [".h", ".c"];
    public IReadOnlyList<string> TemplateFiles { get; } =
        [HeaderTemplate, FloatSourceTemplate, FixedSourceTemplate, CommonTemplate, LicenceTemplate,
         FilterHeaderTemplate, FilterSourceTemplate,
         ClassifierEmitter.CHeaderTemplate, ClassifierEmitter.CSourceTemplate];

    public IReadOnlyList<GeneratedFile> Emit(ScorerPlan plan, TemplateRenderer templates)
    {
        templates.CheckOverrides(Name, TemplateFiles.ToArray());
        var d = new CDialect(plan);
        GeneratedFile File(string template, string fileName)
        {
            var (text, used) = templates.Render(Name, template, globals =>
            {
                d.Register(globals);
                globals.SetValue("file", fileName, readOnly: true);
                globals.SetValue("x", plan is FixedScorerPlan f ? new FixedComments(f, d, d.UName + "_ERROR_BOUND") : null, readOnly: true);
            });
            return new GeneratedFile(fileName, text, used);
        }
        return
        [
            File(HeaderTemplate, d.HeaderFile),
            File(plan is FixedScorerPlan ? FixedSourceTemplate : FloatSourceTemplate, d.Name + ".c"),
        ];
    }
}
