using System.Collections.Immutable;
using Emit.Model;

namespace Emit.Tests;

/// <summary>Random models for property tests (invented data, used only as inputs to independent checks).</summary>
internal static class TestModels
{
    public static BoltzmannModel Random(ModelKind kind, int visible, int hidden, int seed, double scale = 0.6, double linkDensity = 0.3)
    {
        var rng = new System.Random(seed);
        double N() => scale * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
        var b = Enumerable.Range(0, visible).Select(_ => N()).ToImmutableArray();
        var c = Enumerable.Range(0, hidden).Select(_ => N()).ToImmutableArray();
        var w = Enumerable.Range(0, visible * hidden).Select(_ => N()).ToImmutableArray();
        ImmutableArray<Link> Links(int n)
        {
            var list = ImmutableArray.CreateBuilder<Link>();
            for (int i = 0; i < n; i++)
                for (int j = i + 1; j < n; j++)
                    if (rng.NextDouble() < linkDensity) list.Add(new Link(i, j, N()));
            return list.ToImmutable();
        }
        var vl = kind == ModelKind.Rbm ? ImmutableArray<Link>.Empty : Links(visible);
        var hl = kind == ModelKind.General ? Links(hidden) : ImmutableArray<Link>.Empty;
        return new BoltzmannModel(kind, visible, hidden, b, c, w, vl, hl);
    }

    public static byte[] RandomUnits(int visible, Random rng, double p = 0.5)
    {
        var u = new byte[visible];
        for (int i = 0; i < visible; i++) u[i] = (byte)(rng.NextDouble() < p ? 1 : 0);
        return u;
    }

    /// <summary>Unit i of state index <paramref name="bits"/>.</summary>
    public static byte[] Bits(long bits, int n)
    {
        var u = new byte[n];
        for (int i = 0; i < n; i++) u[i] = (byte)((bits >> i) & 1);
        return u;
    }
}
