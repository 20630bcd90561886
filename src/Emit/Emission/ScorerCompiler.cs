using Emit.Model;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>Model + options → generated source files (nothing is written; see <see cref="OutputFolder"/>).</summary>
public static class ScorerCompiler
{
    /// <summary>
    /// Plans the scorer once and lets each requested target lay it out. <paramref name="modelLabel"/> names the
    /// model in banners (a file name, not a path, so output does not depend on where the model lies).
    /// </summary>
    public static IReadOnlyList<GeneratedFile> Compile(BoltzmannModel model, string modelLabel, CompileOptions options)
    {
        Naming.CheckScorerName(options.Name);
        Naming.CheckNamespace(options.Namespace);
        if (options.Targets.Count == 0) throw new EmitException("no target given", $"use --target with one or more of: {Targets.NameList}");
        var emitters = new List<ITargetEmitter>();
        foreach (var name in options.Targets)
        {
            var emitter = Targets.Find(name) ?? throw new EmitException($"unknown target \"{Naming.CommentText(name)}\"", $"use one or more of: {Targets.NameList}");
            if (!emitters.Contains(emitter)) emitters.Add(emitter);
        }
        ScorerPlan plan = options.Numeric == NumericMode.Fixed
            ? FixedScorerPlan.Build(model, options, modelLabel)
            : FloatScorerPlan.Build(model, options, modelLabel);
        var templates = new TemplateRenderer(options.TemplatesDirectory);
        return emitters.SelectMany(e => e.Emit(plan, templates)).ToArray();
    }
}
