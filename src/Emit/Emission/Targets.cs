namespace Emit.Emission;

/// <summary>The one table of output targets; the command line lists and validates targets from it.</summary>
public static class Targets
{
    /// <summary>Every target, in the order the CLI lists them.</summary>
    public static readonly IReadOnlyList<ITargetEmitter> All = [new CEmitter(), new CSharpEmitter()];

    /// <summary>The target named <paramref name="name"/>, or null.</summary>
    public static ITargetEmitter? Find(string name) => All.FirstOrDefault(t => t.Name == name);

    /// <summary>"c, csharp".</summary>
    public static string NameList => string.Join(", ", All.Select(t => t.Name));
}
