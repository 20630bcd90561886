namespace Emit.Harness;

/// <summary>The one table of verification targets; the command line lists and validates targets from it.</summary>
public static class Runners
{
    /// <summary>Every verify target, in the order the CLI lists them.</summary>
    public static readonly IReadOnlyList<ITargetRunner> All = [new HostCRunner(), new CSharpRunner(),
        new CortexM3Runner()];

    /// <summary>The runner named <paramref name="name"/>, or null.</summary>
    public static ITargetRunner? Find(string name) => All.FirstOrDefault(t => t.Name == name);

    /// <summary>"c, csharp, cortex-m3".</summary>
    public static string NameList => string.Join(", ", All.Select(t => t.Name));
}
