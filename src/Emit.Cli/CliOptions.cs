using System.CommandLine;

namespace Emit.Cli;

/// <summary>Options that several commands share, defined once so they read the same everywhere.</summary>
public static class CliOptions
{
    /// <summary><c>--force</c>: replace output files emit did not write (docs/cli.md, "Files emit writes").</summary>
    public static Option<bool> Force() => new("--force")
    {
        Description = "Replace existing output files even when emit did not write them (or they were changed after)",
    };
}
