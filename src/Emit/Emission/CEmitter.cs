using Emit.Emission.Dialects;

namespace Emit.Emission;

/// <summary>
/// C99 target: <c>NAME.h</c> (API, configuration macros) and <c>NAME.c</c> (tables, scoring, self-test).
/// </summary>
public sealed class CEmitter : ITargetEmitter
{
    /// <summary>Template of the header (NAME.h).</summary>
    public const string HeaderTemplate = "scorer.h.sbn";
    /// <summary>Template of the source in f32 and f64 modes (NAME.c).</summary>
    public const string FloatSourceTemplate = "scorer-float.c.sbn";
    /// <summary>Template of the source in fixed mode (NAME.c).</summary>
    public const string FixedSourceTemplate = "scorer-fixed.c.sbn";
    /// <summary>Included by the C templates: banner, constants and entry points shared by every mode.</summary>
    public const string CommonTemplate = "common.c.sbn";
    /// <summary>The licence hook printed at the top of every file (empty by default).</summary>
    public const string LicenceTemplate = "licence.sbn";
    /// <summary>Included by the header when streamed scoring or explanations are emitted.</summary>
    public const string StreamHeaderTemplate = "stream.h.sbn";
    /// <summary>Included by both sources when streamed scoring or explanations are emitted.</summary>
    public const string StreamSourceTemplate = "stream.c.sbn";
    /// <summary>Included in the header when the alarm filter is emitted.</summary>
    public const string FilterHeaderTemplate = "filter.h.sbn";
    /// <summary>Included in the source when the alarm filter is emitted.</summary>
    public const string FilterSourceTemplate = "filter.c.sbn";

    /// <inheritdoc/>
    public string Name => "c";
    /// <inheritdoc/>
    public string Description => "C99 header and source (NAME.h, NAME.c), stdint.h only";
    /// <inheritdoc/>
    public IReadOnlyList<string> Extensions { get; } = [".h", ".c"];
    /// <inheritdoc/>
    public IReadOnlyList<string> TemplateFiles { get; } =
        [
            HeaderTemplate, FloatSourceTemplate, FixedSourceTemplate, CommonTemplate, LicenceTemplate,
            StreamHeaderTemplate, StreamSourceTemplate, FilterHeaderTemplate, FilterSourceTemplate,
            ClassifierEmitter.CHeaderTemplate, ClassifierEmitter.CSourceTemplate,
        ];

    /// <inheritdoc/>
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
                globals.SetValue("x",
                    plan is FixedScorerPlan f ? new FixedComments(f, d, d.UName + "_ERROR_BOUND") : null,
                    readOnly: true);
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
