using System.Collections.Immutable;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Tests.Quantize;

/// <summary>Shared helpers for the fixed-point tests (random models come from <see cref="TestModels"/>).</summary>
internal static class QuantizeTestModels
{
    /// <summary>Largest |fixed − reference| over the given inputs, in nats.</summary>
    public static double MaxError(FixedPointPlan plan, IEnumerable<byte[]> inputs)
    {
        var sim = new FixedPointSimulator(plan);
        var reference = new ReferenceScorer(plan.Model);
        double worst = 0;
        foreach (var u in inputs) worst = Math.Max(worst, Math.Abs(sim.FreeEnergy(u) / sim.Scale - reference.FreeEnergy(u)));
        return worst;
    }

    public static IEnumerable<byte[]> AllInputs(int visible)
    {
        for (long bits = 0; bits < 1L << visible; bits++) yield return TestModels.Bits(bits, visible);
    }

    public static IEnumerable<byte[]> RandomInputs(int visible, int count, int seed)
    {
        var rng = new Random(seed);
        for (int k = 0; k < count; k++) yield return TestModels.RandomUnits(visible, rng, rng.NextDouble());
    }

    /// <summary>A model with every parameter drawn uniformly from ±<paramref name="magnitude"/> (extreme values).</summary>
    public static BoltzmannModel Extreme(ModelKind kind, int v, int h, double magnitude, int seed, bool allPositive = false)
    {
        var rng = new Random(seed);
        double X() => allPositive ? magnitude * (0.5 + 0.5 * rng.NextDouble()) : magnitude * (2 * rng.NextDouble() - 1);
        var links = ImmutableArray.CreateBuilder<Link>();
        if (kind != ModelKind.Rbm)
            for (int i = 0; i < v; i++)
                for (int j = i + 1; j < v; j++) links.Add(new Link(i, j, X()));
        var hlinks = ImmutableArray.CreateBuilder<Link>();
        if (kind == ModelKind.General)
            for (int i = 0; i < h; i++)
                for (int j = i + 1; j < h; j++) hlinks.Add(new Link(i, j, X()));
        return new BoltzmannModel(kind, v, h,
            Enumerable.Range(0, v).Select(_ => X()).ToImmutableArray(),
            Enumerable.Range(0, h).Select(_ => X()).ToImmutableArray(),
            Enumerable.Range(0, v * h).Select(_ => X()).ToImmutableArray(),
            links.ToImmutable(), hlinks.ToImmutable());
    }
}
