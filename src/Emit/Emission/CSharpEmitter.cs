using Emit.Emission.Dialects;

namespace Emit.Emission;

/// <summary>C# target: one file <c>NAME.cs</c> holding a static class, BCL only, no allocation per call.</summary>
public sealed class CSharpEmitter : ITargetEmitter
{
    /// <summary>Template of the C# class in f32 and f64 modes.</summary>
    public const string FloatTemplate = "scorer-float.cs.sbn";
    /// <summary>Template of the C# class in fixed mode.</summary>
    public const string FixedTemplate = "scorer-fixed.cs.sbn";
    /// <summary>Included by the C# templates: banner, constants and entry points shared by every mode.</summary>
    public const string CommonTemplate = "common.cs.sbn";
    /// <summary>The licence hook printed at the top of every file (empty by default).</summary>
    public const string LicenceTemplate = "licence.sbn";
    /// <summary>Included by the C# templates when streamed scoring or explanations are emitted.</summary>
    public const string StreamTemplate = "stream.cs.sbn";
    /// <summary>Included when the alarm filter is emitted.</summary>
    public const string FilterTemplate = "filter.cs.sbn";

    /// <inheritdoc/>
    public string Name => "csharp";
    /// <inheritdoc/>
    public string Description => "C# static class (NAME.cs), BCL only";
    /// <inheritdoc/>
    public IReadOnlyList<string> Extensions { get; } = [".cs"];
    /// <inheritdoc/>
    public IReadOnlyList<string> TemplateFiles { get; } = [FloatTemplate, FixedTemplate, CommonTemplate,
        LicenceTemplate, StreamTemplate, FilterTemplate, ClassifierEmitter.CSharpTemplate];

    /// <inheritdoc/>
    public IReadOnlyList<GeneratedFile> Emit(ScorerPlan plan, TemplateRenderer templates)
    {
        templates.CheckOverrides(Name, TemplateFiles.ToArray());
        var d = new CSharpDialect(plan);
        var (text, used) = templates.Render(Name, plan is FixedScorerPlan ? FixedTemplate : FloatTemplate, globals =>
        {
            d.Register(globals);
            globals.SetValue("file", d.FileName, readOnly: true);
            globals.SetValue("x", plan is FixedScorerPlan f ? new FixedComments(f, d, "ErrorBound") : null,
                readOnly: true);
        });
        return [new GeneratedFile(d.FileName, text, used)];
    }
}
