using Emit.Cli;

namespace Emit.Tests.Cli;

/// <summary>Runs the CLI in-process with captured writers.</summary>
internal static class CliRunner
{
    public sealed record Result(int ExitCode, string Out, string Error);

    public static Result Run(params string[] args)
    {
        var o = new StringWriter { NewLine = "\n" };
        var e = new StringWriter { NewLine = "\n" };
        int code = CliApp.Run(args, o, e);
        return new Result(code, o.ToString(), e.ToString());
    }

    /// <summary>A fresh temporary folder for one test.</summary>
    public static string TempDir()
    {
        var d = Path.Combine(Path.GetTempPath(), "emit-tests", Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(d);
        return d;
    }
}
