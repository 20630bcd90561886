namespace Emit.Harness;

/// <summary>
/// One place generated code runs (host C, .NET, an emulated Cortex-M3). Implementations are listed once, in
/// <see cref="Runners"/>.
/// </summary>
public interface ITargetRunner
{
    /// <summary>The name used with <c>--target</c>.</summary>
    string Name { get; }

    /// <summary>One-line description for help text.</summary>
    string Description { get; }

    /// <summary>The emission target whose sources it runs: <c>c</c> or <c>csharp</c>.</summary>
    string Language { get; }

    /// <summary>
    /// Throws an <see cref="EmitException"/> naming the Debian package to install when a tool it needs is missing.
    /// </summary>
    void CheckTools(RunnerSettings settings);

    /// <summary>
    /// Builds <paramref name="sources"/> with a harness in <paramref name="workDirectory"/> and starts it. Returns null
    /// with a reason when the build fails (for example generated code that does not compile).
    /// </summary>
    IScorerSession? Start(ScorerSources sources, HarnessLayout layout, RunnerSettings settings, string workDirectory,
        out string failure);
}
