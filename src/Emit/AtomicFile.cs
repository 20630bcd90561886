using System.Text;

namespace Emit;

/// <summary>Writes files through a temporary name in the same folder and a rename, so a failure never leaves half a file.</summary>
public static class AtomicFile
{
    private static readonly UTF8Encoding Utf8NoBom = new(false);

    public static void WriteAllText(string path, string text) => Write(path, s =>
    {
        var bytes = Utf8NoBom.GetBytes(text);
        s.Write(bytes, 0, bytes.Length);
    });

    public static void Write(string path, Action<Stream> write)
    {
        var full = Path.GetFullPath(path);
        var dir = Path.GetDirectoryName(full)!;
        try
        {
            Directory.CreateDirectory(dir);
            var tmp = Path.Combine(dir, "." + Path.GetFileName(full) + "." + Environment.ProcessId + ".tmp");
            try
            {
                using (var s = new FileStream(tmp, FileMode.Create, FileAccess.Write, FileShare.None))
                    write(s);
                File.Move(tmp, full, overwrite: true);
            }
            finally
            {
                if (File.Exists(tmp)) File.Delete(tmp);
            }
        }
        catch (IOException e) { throw new EmitException($"cannot write: {e.Message}", "check the folder exists and is writable", path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot write: {e.Message}", "check permissions", path); }
    }
}
