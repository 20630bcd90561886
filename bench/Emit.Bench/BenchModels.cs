using System.Collections.Immutable;
using Emit.Model;

/// <summary>The random models the benchmarks use (Box–Muller normals from System.Random, fixed seeds).</summary>
internal static class BenchModels
{
    public static BoltzmannModel RandomRbm(int v, int h, int seed, double scale)
    {
        var rng = new Random(seed);
        double N() => scale * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
        return new BoltzmannModel(ModelKind.Rbm, v, h,
            Enumerable.Range(0, v).Select(_ => N()).ToImmutableArray(),
            Enumerable.Range(0, h).Select(_ => N()).ToImmutableArray(),
            Enumerable.Range(0, v * h).Select(_ => N()).ToImmutableArray());
    }

    public static byte[] RandomUnits(int rows, int v, int seed, double p)
    {
        var rng = new Random(seed);
        var units = new byte[rows * v];
        for (int k = 0; k < units.Length; k++) units[k] = (byte)(rng.NextDouble() < p ? 1 : 0);
        return units;
    }
}
