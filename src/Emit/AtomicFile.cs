using System.Security.Cryptography;
using System.Text;

namespace Emit;

/// <summary>
/// Every file emit writes goes through here: to a temporary name in the same folder, then renamed into place, so a
/// failure never leaves half a file; and never over a file emit did not write unless forced. A file counts as emit's
/// own when the folder's ledger (<see cref="WrittenLedger"/>) records its current SHA-256: a file edited by hand after
/// emit wrote it is protected again. Character devices (<c>/dev/null</c>, a terminal) are written directly; other
/// special files (FIFOs, sockets, block devices), folders and links to missing files are refused.
/// </summary>
public static class AtomicFile
{
    private static readonly UTF8Encoding Utf8NoBom = new(false);

    /// <summary>Writes <paramref name="text"/> as UTF-8 without a byte-order mark.</summary>
    public static void WriteAllText(string path, string text, bool force) =>
        WriteAll([(path, Utf8NoBom.GetBytes(text))], force);

    /// <summary>Streams one file: <paramref name="write"/> fills it.</summary>
    public static void Write(string path, bool force, Action<Stream> write)
    {
        var target = Check(path, force);
        if (target.Device)
        {
            WriteDevice(target.Path, write);
            return;
        }
        var tmp = TempName(target.Path);
        try
        {
            try { Directory.CreateDirectory(Path.GetDirectoryName(tmp)!); }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException) { throw CannotWrite(e, path); }
            using var sha = SHA256.Create();
            try
            {
                BeforeTempWrite?.Invoke(target.Path);
                using (var file = new FileStream(tmp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
                // A hash transform passes the bytes through unchanged; closing the CryptoStream completes the hash.
                using (var hashing = new CryptoStream(file, sha, CryptoStreamMode.Write, leaveOpen: true))
                    write(hashing);
                File.Move(tmp, target.Path, overwrite: true);
            }
            catch (IOException e) { throw CannotWrite(e, path); }
            catch (UnauthorizedAccessException e) { throw CannotWrite(e, path); }
            WrittenLedger.Record(target.Path, sha.Hash!);
        }
        finally
        {
            TryDelete(tmp);
        }
    }

    /// <summary>
    /// Writes several files as one step: every check first, then every file to a temporary name, then the renames,
    /// so a refused or failed write replaces none of them (short of a failure between two renames).
    /// </summary>
    public static IReadOnlyList<string> WriteAll(IReadOnlyList<(string Path, byte[] Bytes)> files, bool force)
    {
        var targets = files.Select(f => Check(f.Path, force)).ToArray();
        var seen = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        for (int k = 0; k < targets.Length; k++)
            if (!targets[k].Device && !seen.Add(targets[k].Path))
                throw new EmitException("two outputs are the same file",
                    "give each output its own name and folder (names that differ only in letter case clash on some " +
                    "file systems)", files[k].Path);
        var temps = new string?[targets.Length];
        try
        {
            for (int k = 0; k < targets.Length; k++)
            {
                if (targets[k].Device) continue;
                temps[k] = TempName(targets[k].Path);
                try
                {
                    BeforeTempWrite?.Invoke(targets[k].Path);
                    Directory.CreateDirectory(Path.GetDirectoryName(temps[k]!)!);
                    using var s = new FileStream(temps[k]!, FileMode.CreateNew, FileAccess.Write, FileShare.None);
                    s.Write(files[k].Bytes);
                }
                catch (IOException e) { throw CannotWrite(e, files[k].Path); }
                catch (UnauthorizedAccessException e) { throw CannotWrite(e, files[k].Path); }
            }
            for (int k = 0; k < targets.Length; k++)
            {
                try
                {
                    if (targets[k].Device) WriteDevice(targets[k].Path, s => s.Write(files[k].Bytes));
                    else File.Move(temps[k]!, targets[k].Path, overwrite: true);
                }
                catch (IOException e) { throw CannotWrite(e, files[k].Path); }
                catch (UnauthorizedAccessException e) { throw CannotWrite(e, files[k].Path); }
                if (!targets[k].Device) WrittenLedger.Record(targets[k].Path, SHA256.HashData(files[k].Bytes));
            }
        }
        finally
        {
            foreach (var tmp in temps)
                if (tmp is not null) TryDelete(tmp);
        }
        return targets.Select(t => t.Path).ToArray();
    }

    /// <summary>
    /// Throws now what <see cref="Write"/> would throw for <paramref name="path"/> before writing anything, so a long
    /// command (a verification) learns before its work that an output may not be replaced.
    /// </summary>
    public static void Precheck(string path, bool force) => Check(path, force);

    /// <summary>
    /// Refuses <paramref name="output"/> when it names the same file as one of <paramref name="inputs"/> (after
    /// resolving links): a command never replaces a file it is reading, not even with force. <c>-</c> (standard input
    /// or output) and null are skipped. Hard links to one file under two names are not detected.
    /// </summary>
    public static void RefuseInput(string? output, params string?[] inputs)
    {
        if (output is null or "-") return;
        var o = Resolved(output);
        var comparison = OperatingSystem.IsLinux() ? StringComparison.Ordinal : StringComparison.OrdinalIgnoreCase;
        foreach (var input in inputs)
            if (input is not null and not "-" && string.Equals(Resolved(input), o, comparison))
                throw new EmitException("the output is also an input of this command",
                    "write to another file: emit never replaces a file it is reading, even when allowed to replace " +
                    "files", output);
    }

    private static string Resolved(string path)
    {
        var full = RealPath(Path.GetFullPath(path));
        try
        {
            if (File.ResolveLinkTarget(full, returnFinalTarget: true) is { } target) full = RealPath(target.FullName);
        }
        catch (IOException) { }
        return full;
    }

    /// <summary>True when <paramref name="path"/> is a regular file whose content emit wrote there last.</summary>
    public static bool IsEmitsOwn(string path) => WrittenLedger.Matches(path);

    private readonly record struct Target(string Path, bool Device);

    /// <summary>Where a write to <paramref name="path"/> lands, refused when it may not be written.</summary>
    private static Target Check(string path, bool force)
    {
        if (string.IsNullOrEmpty(path)) throw new EmitException("an output file name is empty", "name a file");
        var full = RealPath(Path.GetFullPath(path));
        var kind = SpecialFile.KindOf(full, followLinks: false);
        if (kind == SpecialFileKind.Link)
        {
            string? final;
            try { final = File.ResolveLinkTarget(full, returnFinalTarget: true)?.FullName; }
            catch (IOException e) { throw new EmitException($"cannot follow the link: {e.Message}",
                "replace the link with a file name", path); }
            if (final is null || SpecialFile.KindOf(final, followLinks: false) == SpecialFileKind.Missing)
                throw new EmitException("the output is a link to a missing file",
                    "remove the link or name another file", path);
            full = final;
            kind = SpecialFile.KindOf(full, followLinks: false);
        }
        switch (kind)
        {
            case SpecialFileKind.Missing:
                if (File.Exists(Path.GetDirectoryName(full)))
                throw new EmitException("the output's folder is a file", "name a file in a folder", path);
                return new Target(full, false);
            case SpecialFileKind.Directory:
                throw new EmitException("the output is a folder", "name a file, not a folder", path);
            case SpecialFileKind.CharacterDevice:
                return new Target(full, true);
            case SpecialFileKind.Other:
                throw new EmitException("the output is a special file (a FIFO, socket or block device)",
                    "name a regular file, or - for standard output where the command allows it", path);
        }
        if (!force)
        {
            bool own;
            try { own = WrittenLedger.Matches(full); }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                throw new EmitException($"cannot read the existing file to check who wrote it: {e.Message}",
                    $"move it away, or allow replacing it ({Setting.Force.Ref()})", path);
            }
            if (!own)
                throw new EmitException(
                    "would replace a file that emit did not write (or that was changed after emit wrote it)",
                    $"move it away, choose another name, or allow replacing it ({Setting.Force.Ref()})", path);
        }
        return new Target(full, false);
    }

    /// <summary>
    /// <paramref name="full"/> with every link among its folders resolved (the file itself is left as it is), so two
    /// names of one file compare equal.
    /// </summary>
    private static string RealPath(string full, int depth = 0)
    {
        var root = Path.GetPathRoot(full) ?? "";
        var parts = full[root.Length..].Split(Path.DirectorySeparatorChar, StringSplitOptions.RemoveEmptyEntries);
        var current = root;
        for (int k = 0; k < parts.Length - 1; k++)
        {
            current = Path.Combine(current, parts[k]);
            FileSystemInfo? target = null;
            try
            {
                if (depth < 32 && new DirectoryInfo(current).LinkTarget is not null)
                    target = new DirectoryInfo(current).ResolveLinkTarget(returnFinalTarget: true);
            }
            catch (IOException) { }
            if (target is not null) current = RealPath(Path.Combine(target.FullName, "x"), depth + 1)[..^2];
        }
        return parts.Length == 0 ? full : Path.Combine(current, parts[^1]);
    }

    /// <summary>
    /// A temporary name beside <paramref name="full"/>, unique to this process and call; stale ones of dead processes
    /// are removed first.
    /// </summary>
    private static string TempName(string full)
    {
        var dir = Path.GetDirectoryName(full)!;
        var prefix = "." + Path.GetFileName(full) + ".";
        StaleTemps.Remove(dir, prefix);
        return Path.Combine(dir,
            prefix + Environment.ProcessId + "." + Guid.NewGuid().ToString("N")[..8] + StaleTemps.Suffix);
    }

    private static void WriteDevice(string path, Action<Stream> write)
    {
        try
        {
            using var s = new FileStream(path, FileMode.Open, FileAccess.Write, FileShare.ReadWrite);
            write(s);
        }
        catch (IOException e) { throw CannotWrite(e, path); }
        catch (UnauthorizedAccessException e) { throw CannotWrite(e, path); }
    }

    private static EmitException CannotWrite(Exception e, string path) =>
        e is EmitException ee ? ee
        : new EmitException($"cannot write: {e.Message}", "check the folder exists, is writable and has space", path,
            inner: e);

    private static void TryDelete(string path)
    {
        try { File.Delete(path); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException) { }
    }

    /// <summary>
    /// Tests only: called before each temporary file is created, so a test can make a write fail midway.
    /// </summary>
    internal static Action<string>? BeforeTempWrite;
}
