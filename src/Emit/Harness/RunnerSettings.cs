namespace Emit.Harness;

/// <summary>How targets build and run generated code.</summary>
/// <param name="CCompiler">Host C compiler command (may carry leading arguments, e.g. "ccache gcc"); null: $CC, else
/// cc.</param>
/// <param name="CFlags">Extra flags for the host C compile, after the strict flags.</param>
/// <param name="Timeout">Outer time limit for every external program run (a build, a scorer process batch, one emulator
/// run).</param>
/// <param name="ImageInputs">Inputs compiled into one emulator image; null: as many as fit
/// <see cref="CortexM3Runner.MaxImageInputBytes"/>.</param>
public sealed record RunnerSettings(string? CCompiler = null, string CFlags = "", TimeSpan? Timeout = null,
    int? ImageInputs = null)
{
    /// <summary>Default outer time limit.</summary>
    public static readonly TimeSpan DefaultTimeout = TimeSpan.FromMinutes(5);

    /// <summary>The time limit in force: <see cref="Timeout"/> or the default.</summary>
    public TimeSpan Limit => Timeout ?? DefaultTimeout;

    /// <summary>The host C compiler command split into program and leading arguments.</summary>
    public (string Program, IReadOnlyList<string> Args) HostCompiler()
    {
        var text = CCompiler;
        if (string.IsNullOrWhiteSpace(text)) text = Environment.GetEnvironmentVariable("CC");
        if (string.IsNullOrWhiteSpace(text)) text = "cc";
        var words = Harness.CFlags.Split(text);
        return (words[0], words.Skip(1).ToArray());
    }
}
