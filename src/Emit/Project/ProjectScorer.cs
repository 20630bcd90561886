using Emit.Emission;

namespace Emit.Project;

/// <summary>
/// One entry of a project file: the model to compile (full path), the folder to write to (full path) and the options of
/// <c>emit compile</c>. <see cref="Line"/> is where the entry starts in the project file, for messages. A classifier
/// entry (<c>"models"</c>) lists several models in <see cref="ModelPaths"/> (<see cref="ModelPath"/> is the first)
/// and may give <see cref="Priors"/>; it compiles as <c>emit compile MODEL1 MODEL2 ... --name NAME</c>.
/// </summary>
public sealed record ProjectScorer(string ModelPath, string OutDirectory, CompileOptions Options, long Line)
{
    /// <summary>Every model of the entry (full paths): one for a scorer, two or more for a classifier.</summary>
    public IReadOnlyList<string> ModelPaths { get; init; } = [ModelPath];

    /// <summary>A classifier's prior weights, one per model (null: equal); always null for a scorer.</summary>
    public IReadOnlyList<double>? Priors { get; init; }

    /// <summary>True for a classifier entry (several models).</summary>
    public bool IsClassifier => ModelPaths.Count > 1;

    /// <summary>
    /// The scorer names the entry writes files for: its name, and for a classifier also NAME_1 ... NAME_n (one scorer
    /// per model).
    /// </summary>
    public IReadOnlyList<string> Names =>
    [
        Options.Name,
        .. IsClassifier
            ? Enumerable.Range(1, ModelPaths.Count)
                .Select(k => Options.Name + "_" + k.ToString(System.Globalization.CultureInfo.InvariantCulture))
            : [],
    ];
}
