namespace Emit.Emission;

/// <summary>One output language. Implementations are listed once, in <see cref="Targets"/>.</summary>
public interface ITargetEmitter
{
    /// <summary>The name used with <c>--target</c>.</summary>
    string Name { get; }

    /// <summary>One-line description for help text.</summary>
    string Description { get; }

    /// <summary>File extensions written, in order (".h", ".c").</summary>
    IReadOnlyList<string> Extensions { get; }

    /// <summary>Template files this target reads (names under templates/TARGET/), includes among them.</summary>
    IReadOnlyList<string> TemplateFiles { get; }

    /// <summary>The generated files for a planned scorer, each with the templates it was laid out from.</summary>
    IReadOnlyList<GeneratedFile> Emit(ScorerPlan plan, TemplateRenderer templates);
}
