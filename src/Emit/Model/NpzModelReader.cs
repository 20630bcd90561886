using System.Collections.Immutable;
using System.IO.Compression;
using System.Runtime.InteropServices;

namespace Emit.Model;

/// <summary>
/// Imports a restricted Boltzmann machine from a NumPy <c>.npz</c> archive: a zip file (stored or deflated
/// entries) of NPY arrays named <c>NAME.npy</c>, as <c>np.savez</c> and <c>np.savez_compressed</c> write it.
/// Two namings are understood:
/// <list type="bullet">
/// <item><c>weights</c> (visible × hidden), <c>visible_bias</c>, <c>hidden_bias</c>;</item>
/// <item>scikit-learn's BernoulliRBM attributes <c>components_</c> (hidden × visible, transposed on import),
/// <c>intercept_visible_</c>, <c>intercept_hidden_</c>.</item>
/// </list>
/// Other entries are ignored. The result is a model of kind rbm without unit names. Every problem is an
/// <see cref="EmitException"/> naming the file and the array entry.
/// </summary>
public static class NpzModelReader
{
    private static readonly string[] NativeNames = ["weights", "visible_bias", "hidden_bias"];
    private static readonly string[] SklearnNames = ["components_", "intercept_visible_", "intercept_hidden_"];

    private const string SaveHint =
        "save with np.savez(f, weights=W, visible_bias=b, hidden_bias=c) (W visible × hidden), " +
        "or np.savez(f, components_=rbm.components_, intercept_visible_=rbm.intercept_visible_, " +
        "intercept_hidden_=rbm.intercept_hidden_)";

    /// <summary>Reads the model from the .npz file at <paramref name="path"/>.</summary>
    public static BoltzmannModel Read(string path)
    {
        FileStream stream;
        try
        {
            if (Directory.Exists(path)) throw new EmitException("is a folder, not an .npz file", null, path);
            if (!File.Exists(path)) throw new EmitException("file not found", "check the path", path);
            stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read);
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        catch (UnauthorizedAccessException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
        using (stream)
        {
            if (stream.CanSeek) return Read(stream, path);
            // A FIFO (process substitution): a zip archive is read from its end, so the bytes are copied first,
            // counted as they arrive, since nothing bounds a FIFO in advance.
            using var copy = new MemoryStream();
            var chunk = new byte[1 << 16];
            int got;
            try
            {
                while ((got = stream.Read(chunk)) > 0)
                {
                    if (copy.Length + got > ModelJson.MaxFileBytes)
                        throw new EmitException(
                            $"file is more than {ModelJson.MaxFileBytes} bytes, more than an .npz model may be", null,
                            path);
                    copy.Write(chunk, 0, got);
                }
            }
            catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
            copy.Position = 0;
            return Read(copy, path);
        }
    }

    /// <summary>
    /// Reads the model from a seekable stream holding an .npz archive; <paramref name="file"/> is named in errors.
    /// </summary>
    public static BoltzmannModel Read(Stream stream, string file)
    {
        ArgumentNullException.ThrowIfNull(stream);
        if (!stream.CanSeek) throw new ArgumentException("the stream must be seekable", nameof(stream));
        try
        {
            CheckLooksLikeZip(stream, file);
            ZipArchive zip;
            try
            {
                zip = new ZipArchive(stream, ZipArchiveMode.Read, leaveOpen: true);
            }
            catch (InvalidDataException e)
            {
                throw new EmitException($"is not a readable zip archive ({e.Message.TrimEnd('.')})",
                    "an .npz file is a zip archive of .npy arrays; the file may be truncated. " + SaveHint, file);
            }
            using (zip)
                return ReadArchive(zip, file);
        }
        catch (InvalidDataException e)
        {
            throw new EmitException($"zip archive is damaged ({e.Message.TrimEnd('.')})",
                "the file may be truncated; save it again", file);
        }
        catch (NotSupportedException e)
        {
            throw new EmitException(
                $"zip archive uses a feature this reader does not support ({e.Message.TrimEnd('.')})",
                "save it with np.savez or np.savez_compressed (stored or deflated entries, no encryption)", file);
        }
        catch (IOException e)
        {
            throw new EmitException($"cannot read: {e.Message.TrimEnd('.')}", null, file);
        }
    }

    private static void CheckLooksLikeZip(Stream stream, string file)
    {
        Span<byte> start = stackalloc byte[6];
        long position = stream.Position;
        int got = stream.ReadAtLeast(start, start.Length, throwOnEndOfStream: false);
        stream.Position = position;
        if (got == 0) throw new EmitException("file is empty", "expected an .npz archive; " + SaveHint, file);
        if (got == 6 && start.SequenceEqual(NpyReader.Magic))
            throw new EmitException("is a single .npy array, not an .npz archive", SaveHint, file);
    }

    private static BoltzmannModel ReadArchive(ZipArchive zip, string file)
    {
        var entries = new Dictionary<string, ZipArchiveEntry>(StringComparer.Ordinal);
        foreach (var entry in zip.Entries)
        {
            if (!entry.FullName.EndsWith(".npy", StringComparison.Ordinal)) continue;
            var name = entry.FullName[..^4];
            if (!entries.TryAdd(name, entry))
                throw new EmitException($"array entry {entry.FullName} appears twice in the archive",
                    "save the arrays again with np.savez", file);
        }
        bool native = NativeNames.Any(entries.ContainsKey);
        bool sklearn = SklearnNames.Any(entries.ContainsKey);
        if (native && sklearn)
            throw new EmitException(
                $"mixes the two namings: has {Found(entries, NativeNames)} and {Found(entries, SklearnNames)}",
                "use either weights/visible_bias/hidden_bias or components_/intercept_visible_/intercept_hidden_",
                file);
        if (!native && !sklearn)
            throw new EmitException(
                entries.Count == 0 ? "has no .npy arrays"
                : "has none of the expected arrays (found " +
                $"{string.Join(", ", entries.Keys.Order(StringComparer.Ordinal).Select(k => k + ".npy"))})",
                SaveHint, file);
        var names = native ? NativeNames : SklearnNames;
        foreach (var name in names)
            if (!entries.ContainsKey(name))
                throw new EmitException($"has no array entry {name}.npy (found {Found(entries, names)})", SaveHint,
                    file);

        // Biases first: they fix the sizes the weight matrix's header is checked against before its data is read.
        var visibleBias = ReadVector(entries[names[1]], file, "visible units");
        var hiddenBias = ReadVector(entries[names[2]], file, "hidden units");
        int visible = (int)visibleBias.Shape[0], hidden = (int)hiddenBias.Shape[0];
        if (visible < 1)
            throw NpyReader.Error("has no values: a model needs at least one visible unit", SaveHint, file,
                entries[names[1]].FullName, null);

        var weightsEntry = entries[names[0]];
        long[] expected = native ? [visible, hidden] : [hidden, visible];
        string layout = native ? "visible × hidden" : "hidden × visible (scikit-learn's components_)";
        if ((long)visible * hidden > ModelLimits.MaxWeights)
            throw NpyReader.Error(
                $"would hold {visible} × {hidden} weights, more than the {ModelLimits.MaxWeights} allowed", null, file,
                weightsEntry.FullName, null);
        using var ws = OpenEntry(weightsEntry, file, ModelLimits.MaxWeights);
        var header = NpyReader.ReadHeader(ws, weightsEntry.Length, file, weightsEntry.FullName, ModelLimits.MaxWeights);
        if (header.Shape.Length != 2 || header.Shape[0] != expected[0] || header.Shape[1] != expected[1])
            throw NpyReader.Error(
                $"has shape {header.ShapeText}, expected {NpyHeader.FormatShape(expected)}: {layout}, with {visible} " +
                $"visible units from {entries[names[1]].FullName} and {hidden} hidden units from " +
                $"{entries[names[2]].FullName}",
                native && header.Shape.Length == 2 && header.Shape[0] == hidden && header.Shape[1] == visible
                    ? "weights is visible × hidden; save W.T" : !native && header.Shape.Length == 2
                    && header.Shape[0] == visible && header.Shape[1] == hidden
                    ? "components_ is hidden × visible as scikit-learn stores it; save W.T" : "check the array sizes",
                file, weightsEntry.FullName, null);
        var weights = NpyReader.ReadData(ws, header, file, weightsEntry.FullName);
        CheckFinite(weights, file);

        var w = weights.Values;
        if (!native)
        {
            // components_[j, i] couples hidden j and visible i; the model stores W[i * hidden + j].
            var t = new double[w.Length];
            for (int j = 0; j < hidden; j++)
                for (int i = 0; i < visible; i++)
                    t[i * hidden + j] = w[j * visible + i];
            w = ImmutableCollectionsMarshal.AsImmutableArray(t);
        }
        try
        {
            return new BoltzmannModel(ModelKind.Rbm, visible, hidden, visibleBias.Values, hiddenBias.Values, w);
        }
        catch (EmitException e) { throw e.InFile(file); }
    }

    private static NpyArray ReadVector(ZipArchiveEntry entry, string file, string what)
    {
        using var s = OpenEntry(entry, file, ModelLimits.MaxUnits);
        var header = NpyReader.ReadHeader(s, entry.Length, file, entry.FullName, ModelLimits.MaxUnits);
        if (header.Shape.Length != 1)
            throw NpyReader.Error($"has shape {header.ShapeText}, expected a 1-d array with one value per {what[..^1]}",
                "save a 1-d array (b.ravel())", file, entry.FullName, null);
        var array = NpyReader.ReadData(s, header, file, entry.FullName);
        CheckFinite(array, file);
        return array;
    }

    private static Stream OpenEntry(ZipArchiveEntry entry, string file, long maxElements)
    {
        // Refuse before decompressing anything when even the declared size is out of reach.
        if (entry.Length > NpyReader.MaxHeaderBytes + 12 + maxElements * 8)
            throw NpyReader.Error(
                $"is {entry.Length} bytes uncompressed, more than an array of at most {maxElements} values can need",
                "the file is damaged, or the model is too large for emit", file, entry.FullName, null);
        try
        {
            return new Crc32CheckStream(entry.Open(), entry.Crc32, (want, got) => NpyReader.Error(
                $"fails its checksum (CRC-32 {got:x8}, the archive records {want:x8})",
                "the file is damaged; copy or save it again", file, entry.FullName, null));
        }
        catch (InvalidDataException e)
        {
            throw NpyReader.Error($"cannot be opened ({e.Message.TrimEnd('.')})",
                "save it with np.savez or np.savez_compressed (stored or deflated entries)", file, entry.FullName,
                null);
        }
        catch (NotSupportedException e)
        {
            throw NpyReader.Error($"cannot be opened ({e.Message.TrimEnd('.')})",
                "save it with np.savez or np.savez_compressed (stored or deflated entries, no encryption)", file,
                entry.FullName, null);
        }
    }

    private static void CheckFinite(NpyArray array, string file)
    {
        var v = array.Values;
        for (int k = 0; k < v.Length; k++)
        {
            if (double.IsFinite(v[k])) continue;
            string index = array.Shape.Length == 2 ? $"[{k / array.Shape[1]}, {k % array.Shape[1]}]" : $"[{k}]";
            throw NpyReader.Error($"element {index} is {(double.IsNaN(v[k]) ? "NaN" : v[k] > 0 ? "+inf" : "-inf")}",
                "every parameter must be a finite number; check the training run", file, array.Entry, null);
        }
    }

    private static string Found(Dictionary<string, ZipArchiveEntry> entries, string[] names)
    {
        var found = names.Where(entries.ContainsKey).Select(n => n + ".npy").ToList();
        return found.Count == 0 ? "none of " +
            string.Join(", ", names.Select(n => n + ".npy")) : string.Join(", ", found);
    }
}
