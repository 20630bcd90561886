using Emit.Emission.Dialects;
using Scriban.Runtime;

namespace Emit.Emission;

/// <summary>
/// Lays out a <see cref="ClassifierPlan"/> for one target from its <c>classify.*.sbn</c> templates: C
/// <c>NAME.h</c> and <c>NAME.c</c>, C# <c>NAME.cs</c>. The templates see the classifier as <c>c</c> and the first
/// model's dialect as <c>d</c> (for literals and types, the same for every model).
/// </summary>
public static class ClassifierEmitter
{
    /// <summary>Template files of the classifier, per target.</summary>
    public const string CHeaderTemplate = "classify.h.sbn", CSourceTemplate = "classify.c.sbn",
        CSharpTemplate = "classify.cs.sbn";

    /// <summary>The classifier's files for <paramref name="target"/>.</summary>
    public static IReadOnlyList<GeneratedFile> Emit(string target, ClassifierPlan plan, TemplateRenderer templates)
    {
        var view = new ClassifierView(plan, target);
        TargetDialect d = target == "csharp" ? new CSharpDialect(plan.Models[0]) : new CDialect(plan.Models[0]);
        GeneratedFile File(string template, string fileName)
        {
            var (text, used) = templates.Render(target, template, globals =>
            {
                d.Register(globals);
                globals.SetValue("c", view, readOnly: true);
                globals.Import("classifier_banner", new Func<string, IReadOnlyList<string>>(view.BannerLines));
                globals.SetValue("file", fileName, readOnly: true);
            });
            return new GeneratedFile(fileName, text, used);
        }
        return target == "csharp"
            ? [File(CSharpTemplate, plan.Options.Name + ".cs")]
            : [File(CHeaderTemplate, plan.Options.Name + ".h"), File(CSourceTemplate, plan.Options.Name + ".c")];
    }
}
