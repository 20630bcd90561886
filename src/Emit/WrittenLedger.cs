using System.Security.Cryptography;
using System.Text;

namespace Emit;

/// <summary>
/// The record of what emit wrote into a folder: a file <c>.emit-written</c> beside the outputs, one line per file,
/// <c>SHA256HEX  NAME</c> (the layout of <c>sha256sum</c>, so <c>sha256sum -c .emit-written</c> checks it). A file
/// is emit's own while its content still has the recorded hash; that is what lets emit replace its own outputs and
/// refuse to replace anything else (docs/cli.md, "Files emit writes").
/// </summary>
public static class WrittenLedger
{
    /// <summary>Name of the ledger file in each folder emit writes to.</summary>
    public const string FileName = ".emit-written";

    /// <summary>
    /// True when <paramref name="path"/> is recorded in its folder's ledger with its current content's hash.
    /// </summary>
    public static bool Matches(string path)
    {
        var full = Path.GetFullPath(path);
        var ledger = Path.Combine(Path.GetDirectoryName(full)!, FileName);
        if (!File.Exists(ledger) || !File.Exists(full)) return false;
        var recorded = Read(File.ReadAllText(ledger)).GetValueOrDefault(Path.GetFileName(full));
        if (recorded is null) return false;
        using var stream = File.OpenRead(full);
        return Convert.ToHexStringLower(SHA256.HashData(stream)) == recorded;
    }

    /// <summary>Records that emit wrote <paramref name="path"/> with content hash <paramref name="sha256"/>.</summary>
    public static void Record(string path, byte[] sha256)
    {
        var full = Path.GetFullPath(path);
        var ledger = Path.Combine(Path.GetDirectoryName(full)!, FileName);
        // Read-modify-write under an exclusive handle, retried briefly when another emit process holds it.
        for (int attempt = 0; ; attempt++)
        {
            try
            {
                using var s = new FileStream(ledger, FileMode.OpenOrCreate, FileAccess.ReadWrite, FileShare.None);
                var entries = Read(new StreamReader(s, Encoding.UTF8, false, 4096, leaveOpen: true).ReadToEnd());
                entries[Path.GetFileName(full)] = Convert.ToHexStringLower(sha256);
                var text = new StringBuilder();
                foreach (var (name, hash) in entries.OrderBy(e => e.Key, StringComparer.Ordinal))
                    text.Append(hash).Append("  ").Append(name).Append('\n');
                s.SetLength(0);
                s.Write(Encoding.UTF8.GetBytes(text.ToString()));
                return;
            }
            catch (IOException) when (attempt < 50)
            {
                Thread.Sleep(20);
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                // The output itself was written; without the record emit will only ask for --force next time.
                return;
            }
        }
    }

    private static Dictionary<string, string> Read(string text)
    {
        var entries = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var line in text.Split('\n'))
        {
            // "HASH  NAME": 64 hex digits, two spaces, the file name (which may itself contain spaces).
            if (line.Length > 66 && line[64] == ' ' && line[65] == ' ')
                entries[line[66..]] = line[..64];
        }
        return entries;
    }
}
