using Emit.Cli;

namespace Emit.Tests.Cli;

/// <summary>Runs the CLI in-process with captured writers.</summary>
internal static class CliRunner
{
    public sealed record Result(int ExitCode, string Out, string Error);

    public static Result Run(params string[] args) => RunWithInput(null, args);

    public static Result RunWithInput(string? stdin, params string[] args)
    {
        var o = new StringWriter { NewLine = "\n" };
        var e = new StringWriter { NewLine = "\n" };
        using var input = stdin is null ? null : new MemoryStream(System.Text.Encoding.UTF8.GetBytes(stdin));
        int code = CliApp.Run(args, o, e, input);
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
