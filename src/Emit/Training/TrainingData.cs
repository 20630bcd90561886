using System.Collections.Immutable;
using System.Security.Cryptography;
using Emit.Vectors;

namespace Emit.Training;

/// <summary>
/// Training or validation rows held in memory: <see cref="Rows"/> × <see cref="Width"/> bytes of 0/1, row-major,
/// with the unit names of the file's header (if any), where they came from and the SHA-256 of the file's bytes.
/// </summary>
public sealed class TrainingData
{
    /// <summary>
    /// Wraps rows already in memory (each 0 or 1); <paramref name="source"/> names them in errors and metadata.
    /// </summary>
    public TrainingData(byte[] units, int width, ImmutableArray<string> names, string source, string sha256)
    {
        ArgumentNullException.ThrowIfNull(units);
        if (width < 1 || units.Length % width != 0)
            throw new EmitException($"{units.Length} values do not make rows of {width}", null, source);
        foreach (var u in units)
            if (u > 1) throw new EmitException("a value is neither 0 nor 1", null, source);
        Units = units;
        Width = width;
        Rows = units.Length / width;
        Names = names.IsDefault ? ImmutableArray<string>.Empty : names;
        Source = source;
        Sha256 = sha256;
    }

    /// <summary>All rows, row-major, one byte (0 or 1) per unit.</summary>
    public byte[] Units { get; }

    /// <summary>Units per row.</summary>
    public int Width { get; }

    /// <summary>Number of rows.</summary>
    public int Rows { get; }

    /// <summary>Unit names from the header, or empty.</summary>
    public ImmutableArray<string> Names { get; }

    /// <summary>The file the rows came from (as given), for errors and metadata.</summary>
    public string Source { get; }

    /// <summary>Lower-case hex SHA-256 of the file's bytes.</summary>
    public string Sha256 { get; }

    /// <summary>Row <paramref name="r"/>.</summary>
    public ReadOnlySpan<byte> Row(int r) => Units.AsSpan(r * Width, Width);

    /// <summary>
    /// Reads a vector file (docs/vector-files.md; <c>-</c> is standard input) whole. Bad values, wrong widths and
    /// an empty file are <see cref="EmitException"/>s naming the file and line, from <see cref="VectorReader"/>.
    /// </summary>
    /// <param name="path">The file, or <c>-</c>.</param>
    /// <param name="width">Required width (the training data's, when reading validation rows), or null.</param>
    /// <param name="stdin">Standard input for <c>-</c>; the console's when null.</param>
    public static TrainingData Load(string path, int? width = null, Stream? stdin = null)
    {
        string source = path;
        Stream input;
        try
        {
            if (path == VectorReader.StdinPath)
            {
                input = stdin ?? Console.OpenStandardInput();
                source = VectorReader.StdinName;
            }
            else
            {
                if (Directory.Exists(path)) throw new EmitException("is a folder, not a vector file", null, path);
                if (!File.Exists(path)) throw new EmitException("file not found", "check the path", path);
                input = File.OpenRead(path);
            }
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }

        // Streamed through the reader (which refuses endless lines, so /dev/zero fails at once) and hashed on the way.
        using var sha = SHA256.Create();
        using var hashing = new CryptoStream(input, sha, CryptoStreamMode.Read,
            leaveOpen: path == VectorReader.StdinPath && stdin is not null);
        using var reader = new VectorReader(hashing, source, width, leaveOpen: true);
        var row = new byte[reader.Width];
        var all = new MemoryStream();
        int rows = 0;
        while (reader.TryRead(row))
        {
            all.Write(row);
            rows++;
        }
        if (rows == 0)
            throw new EmitException("file has a header but no vectors",
                "write one vector of 0/1 values per line after the header", source);
        return new TrainingData(all.ToArray(), reader.Width, reader.Names, source,
            Convert.ToHexStringLower(HashToEnd(hashing, sha)));
    }

    /// <summary>
    /// Reads what is left of <paramref name="hashing"/> (the hash covers the whole file) and returns the hash.
    /// </summary>
    private static byte[] HashToEnd(CryptoStream hashing, HashAlgorithm sha)
    {
        hashing.CopyTo(Stream.Null);
        return sha.Hash!;
    }

    /// <summary>
    /// Rows given as arrays (tests, the demo), with the SHA-256 of their CSV text as <see cref="Sha256"/>.
    /// </summary>
    public static TrainingData FromRows(IReadOnlyList<ImmutableArray<byte>> rows, ImmutableArray<string> names,
        string source)
    {
        ArgumentNullException.ThrowIfNull(rows);
        if (rows.Count == 0) throw new EmitException("no rows", null, source);
        int width = rows[0].Length;
        var units = new byte[rows.Count * width];
        for (int r = 0; r < rows.Count; r++)
        {
            if (rows[r].Length != width)
                throw new EmitException($"row {r} has {rows[r].Length} values, expected {width}", null, source);
            rows[r].CopyTo(units, r * width);
        }
        var text = System.Text.Encoding.UTF8.GetBytes(Csv(units, width, names));
        return new TrainingData(units, width, names, source, Convert.ToHexStringLower(SHA256.HashData(text)));
    }

    /// <summary>
    /// The rows as a vector file: header of names (when there are names), then one comma-separated row per line, "\n"
    /// line ends.
    /// </summary>
    public static string Csv(byte[] units, int width, ImmutableArray<string> names)
    {
        var sb = new System.Text.StringBuilder(units.Length * 2 + 1024);
        if (!names.IsDefaultOrEmpty) sb.AppendJoin(',', names).Append('\n');
        for (int r = 0; r < units.Length / width; r++)
        {
            for (int i = 0; i < width; i++)
            {
                if (i > 0) sb.Append(',');
                sb.Append(units[r * width + i] != 0 ? '1' : '0');
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }
}
