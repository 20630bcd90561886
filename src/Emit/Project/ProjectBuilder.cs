using Emit.Emission;
using Emit.Model;

namespace Emit.Project;

/// <summary>
/// Generates every scorer and classifier of a project: all are compiled in memory first, and only when every one
/// succeeded are the files written (each scorer's sources with its manifest, a classifier's files with its own and its
/// models' scorers, docs/manifest.md), all folders in one step
/// (<see cref="OutputFolder.WriteAll"/>), so a failing project changes nothing.
/// </summary>
public static class ProjectBuilder
{
    /// <summary>Compiles the project's scorers and writes them; returns the paths written.</summary>
    public static IReadOnlyList<string> Build(EmitProject project, bool force)
    {
        var groups = new List<(string Folder, IReadOnlyList<GeneratedFile> Files)>();
        var models = new Dictionary<string, BoltzmannModel>(StringComparer.Ordinal);
        for (int k = 0; k < project.Scorers.Count; k++)
        {
            var scorer = project.Scorers[k];
            try
            {
                var loaded = scorer.ModelPaths.Select(path =>
                {
                    if (!models.TryGetValue(path, out var model)) models[path] = model = ModelLoader.Load(path);
                    return model;
                }).ToArray();
                var labels = scorer.ModelPaths.Select(Path.GetFileName).ToArray();
                groups.Add((scorer.OutDirectory, scorer.IsClassifier
                    ? ClassifierCompiler.Build(loaded, labels!, scorer.Priors, scorer.Options).AllFiles
                    : ScorerCompiler.Build(loaded[0], labels[0]!, scorer.Options).AllFiles));
            }
            catch (EmitException e) when (e.File is null)
            {
                // An option the compiler refused: name the project entry it came from.
                throw new EmitException($"scorers[{k}] ({scorer.Options.Name}): {e.Problem}", e.Hint, project.Path,
                    scorer.Line);
            }
        }
        return OutputFolder.WriteAll(groups, force);
    }
}
