namespace Emit.Harness;

/// <summary>An external program a target needs and the Debian package that provides it.</summary>
/// <param name="Program">Program name (searched on PATH) or path.</param>
/// <param name="Package">Debian package to install it from.</param>
/// <param name="Purpose">What it is for, for messages ("C compiler").</param>
public sealed record Tool(string Program, string Package, string Purpose)
{
    /// <summary>
    /// Full path of <paramref name="program"/>: itself when it names an existing file, else the first match on PATH;
    /// null when missing.
    /// </summary>
    public static string? Find(string program)
    {
        if (program.Length == 0) return null;
        if (program.Contains(Path.DirectorySeparatorChar) || program.Contains(Path.AltDirectorySeparatorChar))
            return File.Exists(program) ? Path.GetFullPath(program) : null;
        foreach (var dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator))
        {
            if (dir.Length == 0) continue;
            var path = Path.Combine(dir, program);
            if (File.Exists(path)) return path;
        }
        return null;
    }

    /// <summary>
    /// The tool's full path; throws an <see cref="EmitException"/> naming the package to install when it is missing.
    /// </summary>
    public string Require(string target, string? alternative = null)
    {
        var path = Find(Program);
        if (path is not null) return path;
        var hint = $"install the Debian package {Package} (apt-get install {Package})";
        if (alternative is not null) hint += ", or " + alternative;
        throw new EmitException($"target {target}: {Purpose} \"{Program}\" not found", hint);
    }
}
