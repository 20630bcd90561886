using System.Security.Cryptography;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Detection;

/// <summary>Free energies of every vector of a file, in order, by the double-precision reference scorer.</summary>
public static class EnergyLog
{
    private const int BatchRows = 4096;

    /// <summary>
    /// Reads <paramref name="reader"/> to the end and scores each vector with <paramref name="model"/>.
    /// </summary>
    public static double[] Score(BoltzmannModel model, VectorReader reader)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(reader);
        var scorer = new ReferenceScorer(model);
        var result = new List<double>();
        var units = new byte[BatchRows * model.Visible];
        var energies = new double[BatchRows];
        int rows;
        while ((rows = reader.ReadBatch(units, BatchRows)) > 0)
        {
            scorer.FreeEnergies(units, rows, energies);
            result.AddRange(energies.AsSpan(0, rows));
        }
        return result.ToArray();
    }

    /// <summary>
    /// Scores the vector file <paramref name="path"/> (<c>-</c> = <paramref name="stdin"/>, or the console's standard
    /// input when null), checking its header against the model's names.
    /// </summary>
    public static double[] ScoreFile(BoltzmannModel model, string path, Stream? stdin = null)
    {
        ArgumentNullException.ThrowIfNull(model);
        using var reader = VectorReader.Open(path, model.Visible, stdin);
        VectorNames.Check(model, reader);
        return Score(model, reader);
    }

    /// <summary>
    /// As <see cref="ScoreFile"/>, with the lower-case hex SHA-256 of the file's bytes (standard input is read into
    /// memory).
    /// </summary>
    public static (double[] Energies, string Sha256) ScoreFileHashed(BoltzmannModel model, string path,
        Stream? stdin = null)
    {
        ArgumentNullException.ThrowIfNull(model);
        if (path == VectorReader.StdinPath)
        {
            var ms = new MemoryStream();
            (stdin ?? Console.OpenStandardInput()).CopyTo(ms);
            var sha = Convert.ToHexStringLower(SHA256.HashData(ms.GetBuffer().AsSpan(0, (int)ms.Length)));
            ms.Position = 0;
            using var reader = new VectorReader(ms, VectorReader.StdinName, model.Visible);
            VectorNames.Check(model, reader);
            return (Score(model, reader), sha);
        }
        var energies = ScoreFile(model, path);
        try
        {
            using var file = File.OpenRead(path);
            return (energies, Convert.ToHexStringLower(SHA256.HashData(file)));
        }
        catch (IOException e) { throw new EmitException($"cannot read: {e.Message}", null, path); }
    }

    /// <summary>The name a data path has in reports: the file name, or <c>stdin</c>.</summary>
    public static string DisplayName(string path) =>
        path == VectorReader.StdinPath ? VectorReader.StdinName : Path.GetFileName(path);
}
