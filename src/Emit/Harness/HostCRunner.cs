namespace Emit.Harness;

/// <summary>
/// Target <c>c</c>: the generated C built with the host compiler (<c>--cc</c>, else <c>$CC</c>, else <c>cc</c>) and the
/// strict flags, plus the harness main from <c>templates/harness/main.c.sbn</c>, run as one process that streams inputs
/// in and results out.
/// </summary>
public sealed class HostCRunner : ITargetRunner
{
    /// <inheritdoc/>
    public string Name => "c";
    /// <inheritdoc/>
    public string Description => "generated C99 built with the host C compiler and the strict flags";
    /// <inheritdoc/>
    public string Language => "c";

    private static Tool Compiler(RunnerSettings settings) => new(settings.HostCompiler().Program, "gcc", "C compiler");

    /// <inheritdoc/>
    public void CheckTools(RunnerSettings settings) =>
        Compiler(settings).Require(Name, $"pass {Setting.CCompiler.Ref()} PATH");

    /// <summary>
    /// Compiles the generated C and the harness main into an executable in <paramref name="workDirectory"/>; returns
    /// its path, or null with the compiler's messages.
    /// </summary>
    public static string? Build(ScorerSources sources, HarnessLayout layout, RunnerSettings settings,
        string workDirectory, out string failure)
    {
        var (program, prefix) = settings.HostCompiler();
        var cc = Compiler(settings).Require("c", $"pass {Setting.CCompiler.Ref()} PATH");
        Directory.CreateDirectory(workDirectory);
        var main = Path.Combine(workDirectory, "emit-harness-main.c");
        File.WriteAllText(main, HarnessTemplates.Main(sources, layout, "emit-harness-main.c"));
        var exe = Path.Combine(workDirectory, "emit-harness-" + sources.Name);
        var args = new List<string>(prefix);
        args.AddRange(CFlags.Split(CFlags.Strict));
        args.Add("-O2");
        args.AddRange(CFlags.Split(settings.CFlags));
        args.AddRange(["-I", sources.Directory, sources.SourceFile,
            .. sources.CompanionFiles.Where(f => f.EndsWith(".c", StringComparison.Ordinal)),
            main, "-o", exe, "-lm"]);
        var result = ExternalProcess.Run(cc, args, settings.Limit, workDirectory);
        if (!result.Ok)
        {
            failure = result.TimedOut
                ? $"{program} did not finish within {settings.Limit.TotalSeconds:F0} s"
                : $"the generated C does not compile with {program} {CFlags.Strict} -O2 {settings.CFlags}".TrimEnd() +
                ":\n" + result.Tail();
            return null;
        }
        failure = "";
        return exe;
    }

    /// <inheritdoc/>
    public IScorerSession? Start(ScorerSources sources, HarnessLayout layout, RunnerSettings settings,
        string workDirectory, out string failure)
    {
        var exe = Build(sources, layout, settings, workDirectory, out failure);
        return exe is null ? null
            : ProcessSession.Start(exe, [], workDirectory, layout, settings.Limit, "the C harness", out failure);
    }
}
