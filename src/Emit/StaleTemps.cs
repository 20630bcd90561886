namespace Emit;

/// <summary>
/// Temporary files emit writes before renaming them into place: <c>.NAME.PID.RANDOM.emit-tmp</c>. A process killed
/// between the two steps (SIGKILL, power loss) leaves one behind; the next write to the same name removes those whose
/// process is gone.
/// </summary>
public static class StaleTemps
{
    /// <summary>Suffix of emit's temporary files.</summary>
    public const string Suffix = ".emit-tmp";

    /// <summary>
    /// Deletes the temporary files in <paramref name="folder"/> whose names start with <paramref name="prefix"/> and
    /// whose writing process is gone.
    /// </summary>
    public static void Remove(string folder, string prefix)
    {
        IEnumerable<string> candidates;
        try { candidates = Directory.EnumerateFiles(folder, prefix + "*" + Suffix).ToArray(); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException) { return; }
        foreach (var path in candidates)
        {
            var middle = Path.GetFileName(path)[prefix.Length..^Suffix.Length];
            int dot = middle.IndexOf('.');
            if (dot <= 0 || !int.TryParse(middle[..dot], out int pid) || IsRunning(pid)) continue;
            try { File.Delete(path); }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException) { }
        }
    }

    private static bool IsRunning(int pid)
    {
        if (pid == Environment.ProcessId) return true;
        if (OperatingSystem.IsLinux()) return Directory.Exists("/proc/" + pid);
        try
        {
            using var p = System.Diagnostics.Process.GetProcessById(pid);
            return !p.HasExited;
        }
        catch (ArgumentException) { return false; }
    }
}
