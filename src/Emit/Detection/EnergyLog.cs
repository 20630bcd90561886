using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Detection;

/// <summary>Free energies of every vector a reader gives, in order, by the double-precision reference scorer.</summary>
public static class EnergyLog
{
    private const int BatchRows = 4096;

    /// <summary>Reads <paramref name="reader"/> to the end and scores each vector with <paramref name="model"/>.</summary>
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
}
