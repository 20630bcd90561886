namespace Emit.Harness;

/// <summary>
/// Target <c>csharp</c>: the generated class and the harness program from <c>templates/harness/Program.cs.sbn</c> in a
/// temporary project, built once per run with <c>dotnet build</c> and run as one process that streams inputs in and
/// results out.
/// </summary>
public sealed class CSharpRunner : ITargetRunner
{
    /// <inheritdoc/>
    public string Name => "csharp";
    /// <inheritdoc/>
    public string Description => "generated C# built with dotnet build in a temporary project";
    /// <inheritdoc/>
    public string Language => "csharp";

    /// <inheritdoc/>
    public void CheckTools(RunnerSettings settings) => CSharpProject.RequireDotnet(Name);

    /// <inheritdoc/>
    public IScorerSession? Start(ScorerSources sources, HarnessLayout layout, RunnerSettings settings,
        string workDirectory, out string failure)
    {
        var files = new Dictionary<string, string>
        {
            [Path.GetFileName(sources.MainFile)] = File.ReadAllText(sources.MainFile),
            ["emit-harness.cs"] = HarnessTemplates.Program(sources, "emit-harness.cs"),
        };
        foreach (var f in sources.CompanionFiles.Where(f => f.EndsWith(".cs", StringComparison.Ordinal)))
            files[Path.GetFileName(f)] = File.ReadAllText(f);
        var dll = CSharpProject.Build(workDirectory, files, new CSharpProject.Settings(), settings.Limit, out failure);
        if (dll is null) return null;
        return ProcessSession.Start(CSharpProject.RequireDotnet(Name), [dll], workDirectory, layout, settings.Limit,
            "the C# harness", out failure);
    }
}
