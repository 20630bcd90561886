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
    public static IReadOnlyList<GeneratedFile> Compile(BoltzmannModel model, string modelLabel,
        CompileOptions options) =>
        Build(model, modelLabel, options).Files;

    /// <summary>
    /// As <see cref="Compile"/>, keeping the plan, the templates read and the manifest written beside the sources
    /// (docs/manifest.md).
    /// </summary>
    public static CompiledScorer Build(BoltzmannModel model, string modelLabel, CompileOptions options)
    {
        Naming.CheckScorerName(options.Name);
        Naming.CheckNamespace(options.Namespace);
        if (options.Targets.Count == 0)
            throw new EmitException("no target given",
                $"use {Setting.Targets.Ref()} with one or more of: {Targets.NameList}");
        var emitters = new List<ITargetEmitter>();
        foreach (var name in options.Targets)
        {
            var emitter = Targets.Find(name)
                ?? throw new EmitException($"unknown target \"{Naming.CommentText(name)}\"",
                    $"use one or more of: {Targets.NameList}");
            if (!emitters.Contains(emitter)) emitters.Add(emitter);
        }
        ScorerPlan plan = options.Numeric == NumericMode.Fixed
            ? FixedScorerPlan.Build(model, options, modelLabel)
            : FloatScorerPlan.Build(model, options, modelLabel);
        var templates = new TemplateRenderer(options.TemplatesDirectory);
        var files = emitters.SelectMany(e => e.Emit(plan, templates).Select(f => (e.Name, f))).ToArray();
        return new CompiledScorer(plan, emitters.Select(e => e.Name).ToArray(), files,
            TemplatesRead(files.Select(f => f.f)));
    }

    /// <summary>
    /// Every template behind the files, once each, in the order first read, with the SHA-256 of its text as read.
    /// </summary>
    internal static IReadOnlyList<TemplateUse> TemplatesRead(IEnumerable<GeneratedFile> files)
    {
        var used = new List<TemplateUse>();
        foreach (var t in files.SelectMany(f => f.Templates))
        {
            int slash = t.Name.IndexOf('/');
            string target = t.Name[..slash], file = t.Name[(slash + 1)..];
            if (used.Any(u => u.Target == target && u.File == file)) continue;
            var sha = Convert.ToHexStringLower(
                System.Security.Cryptography.SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(t.Text)));
            used.Add(new TemplateUse(target, file, t.IsOverride, sha));
        }
        return used;
    }
}
