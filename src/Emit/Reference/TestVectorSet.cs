using Emit.Model;

namespace Emit.Reference;

/// <summary>Where a generated test vector came from.</summary>
public enum VectorOrigin
{
    /// <summary>Every unit 0.</summary>
    AllOff,
    /// <summary>Every unit 1.</summary>
    AllOn,
    /// <summary>For one hidden unit, the visible units with a positive weight to it on: its largest input.</summary>
    UnitMaximiser,
    /// <summary>For one hidden unit, the visible units with a negative weight to it on: its smallest input.</summary>
    UnitMinimiser,
    /// <summary>One of a pair of vectors one bit apart on either side of the threshold.</summary>
    NearThreshold,
    /// <summary>A sample of the model (Gibbs chain).</summary>
    Sample,
    /// <summary>A row of the user's data.</summary>
    Data,
}

/// <summary>One generated test vector (one byte per visible unit) and its origin.</summary>
public sealed record TestVector(byte[] Units, VectorOrigin Origin);

/// <summary>Settings of <see cref="TestVectorSet.Generate"/>.</summary>
public sealed record TestVectorOptions(int Count, ulong Seed = 1, int BurnIn = 1000, int Thinning = 10, int Chains = 4);

/// <summary>
/// Deterministic test vectors that exercise a scorer where it is most likely to go wrong: all-off and all-on;
/// for each hidden unit the vectors that maximise and minimise its input (v_i = 1 exactly where W_ij &gt; 0,
/// resp. &lt; 0); when the model has a threshold, pairs of vectors one bit apart on either side of it, found by
/// walking bit flips from a normal sample to an unusual vector; samples from the model by Gibbs sampling
/// (<see cref="TestVectorOptions.BurnIn"/> sweeps of burn-in per chain, then one sample every
/// <see cref="TestVectorOptions.Thinning"/> sweeps); and rows of a data set when one is given.
/// </summary>
public static class TestVectorSet
{
    /// <summary>
    /// Generates the test vectors of <paramref name="options"/> for <paramref name="model"/>, with rows of user data
    /// first when given.
    /// </summary>
    public static IReadOnlyList<TestVector> Generate(BoltzmannModel model, TestVectorOptions options,
        IReadOnlyList<byte[]>? data = null)
    {
        if (options.Count < 1) throw new EmitException("the vector count must be at least 1");
        int n = options.Count, v = model.Visible;
        var result = new List<TestVector>(n);
        void Add(byte[] units, VectorOrigin origin) { if (result.Count < n) result.Add(new TestVector(units, origin)); }

        Add(new byte[v], VectorOrigin.AllOff);
        Add(Enumerable.Repeat((byte)1, v).ToArray(), VectorOrigin.AllOn);
        // Extremes take at most half of the set; the rest is shared by threshold pairs, samples and data.
        for (int j = 0; j < model.Hidden && result.Count < Math.Max(2, n / 2); j++)
        {
            var max = new byte[v];
            var min = new byte[v];
            for (int i = 0; i < v; i++)
            {
                double w = model.Weight(i, j);
                if (w > 0) max[i] = 1; else if (w < 0) min[i] = 1;
            }
            Add(max, VectorOrigin.UnitMaximiser);
            Add(min, VectorOrigin.UnitMinimiser);
        }
        int remaining = n - result.Count;
        if (remaining <= 0) return result;
        int fromData = data is { Count: > 0 } ? remaining / 3 : 0;
        int nearThreshold = model.Threshold is null ? 0 : remaining / 4;
        int samples = remaining - fromData - nearThreshold;

        var rng = new Xoshiro256(options.Seed);
        var sampled = Samples(model, Math.Max(samples, nearThreshold > 0 ? 1 : 0), options, rng);
        foreach (var s in sampled.Take(samples)) Add(s, VectorOrigin.Sample);
        if (nearThreshold > 0)
            foreach (var s in NearThreshold(model, sampled, nearThreshold, rng)) Add(s, VectorOrigin.NearThreshold);
        if (fromData > 0)
            for (int k = 0; k < fromData; k++)
                Add(data![(int)((long)k * data.Count / fromData)].ToArray(), VectorOrigin.Data);
        // Whatever is still missing (too few threshold crossings, say) is filled with more samples.
        if (result.Count < n)
            foreach (var s in Samples(model, n - result.Count, options with { Seed = options.Seed + 1 }, rng))
                Add(s, VectorOrigin.Sample);
        return result;
    }

    private static List<byte[]> Samples(BoltzmannModel model, int count, TestVectorOptions o, Xoshiro256 rng)
    {
        var list = new List<byte[]>(count);
        if (count == 0) return list;
        var chain = new GibbsChain(model);
        int chains = Math.Max(1, Math.Min(o.Chains, count));
        for (int c = 0; c < chains; c++)
        {
            var v = new byte[model.Visible];
            var h = new byte[model.Hidden];
            chain.SampleBase(v, h, rng);
            for (int t = 0; t < o.BurnIn; t++) chain.Sweep(v, h, 1.0, rng);
            int share = count / chains + (c < count % chains ? 1 : 0);
            for (int k = 0; k < share; k++)
            {
                for (int t = 0; t < o.Thinning; t++) chain.Sweep(v, h, 1.0, rng);
                list.Add(v.ToArray());
            }
        }
        return list;
    }

    /// <summary>
    /// Pairs one bit apart with F on either side of the threshold: from a normal vector, flip the bits in which
    /// it differs from an unusual one, in random order, until F crosses the threshold.
    /// </summary>
    private static IEnumerable<byte[]> NearThreshold(BoltzmannModel model, List<byte[]> samples, int count,
        Xoshiro256 rng)
    {
        var scorer = new ReferenceScorer(model);
        double t = model.Threshold!.Value;
        byte[][] extremes = [new byte[model.Visible], Enumerable.Repeat((byte)1, model.Visible).ToArray()];
        var candidates = samples.Concat(extremes).ToList();
        var normal = candidates.Where(x => scorer.FreeEnergy(x) <= t).ToList();
        var unusual = candidates.Where(x => scorer.FreeEnergy(x) > t).ToList();
        if (normal.Count == 0 || unusual.Count == 0) yield break;
        int produced = 0;
        for (int attempt = 0; produced < count && attempt < 4 * count; attempt++)
        {
            var cur = normal[rng.NextInt(normal.Count)].ToArray();
            var target = unusual[rng.NextInt(unusual.Count)];
            var diff = Enumerable.Range(0, cur.Length).Where(i => cur[i] != target[i]).ToArray();
            for (int k = diff.Length - 1; k > 0; k--) { int r = rng.NextInt(k + 1); (diff[k], diff[r]) = (diff[r],
                diff[k]); }
            foreach (int i in diff)
            {
                var before = cur.ToArray();
                cur[i] = target[i];
                if (scorer.FreeEnergy(cur) > t)
                {
                    yield return before;
                    produced++;
                    if (produced < count) { yield return cur; produced++; }
                    break;
                }
            }
        }
    }
}
