using Emit.Model;

namespace Emit.Emission;

/// <summary>
/// The inputs embedded in a generated scorer's self-test, in this order: all units off, all on, the input that
/// maximises the summed hidden pre-activations (unit i on when Σ_j W_ij &gt; 0; with no hidden units, when b_i &gt; 0),
/// the one that minimises them, then pseudo-random inputs with densities cycling 1/2, 1/8, 7/8 from a fixed-seed
/// SplitMix64 generator (Steele, Lea and Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014), so
/// the same model always gets the same vectors.
/// </summary>
public static class SelfTestVectors
{
    /// <summary>The first <paramref name="count"/> vectors, one byte per unit (0 or 1).</summary>
    public static IReadOnlyList<byte[]> Choose(BoltzmannModel model, int count)
    {
        int v = model.Visible;
        var list = new List<byte[]>(count);
        var off = new byte[v];
        var on = Enumerable.Repeat((byte)1, v).ToArray();
        var max = new byte[v];
        var min = new byte[v];
        for (int i = 0; i < v; i++)
        {
            double s = 0;
            if (model.Hidden == 0) s = model.VisibleBias[i];
            else foreach (var w in model.WeightRow(i)) s += w;
            max[i] = (byte)(s > 0 ? 1 : 0);
            min[i] = (byte)(s < 0 ? 1 : 0);
        }
        foreach (var fixedVector in new[] { off, on, max, min })
            if (list.Count < count) list.Add(fixedVector);
        ulong state = 0x454D4954_53454C46UL; // fixed seed
        double[] densities = [0.5, 0.125, 0.875];
        for (int n = 0; list.Count < count; n++)
        {
            double p = densities[n % densities.Length];
            var x = new byte[v];
            for (int i = 0; i < v; i++) x[i] = (byte)(NextUnit(ref state) < p ? 1 : 0);
            list.Add(x);
        }
        return list;
    }

    /// <summary>SplitMix64 step mapped to [0, 1) with 53 bits.</summary>
    private static double NextUnit(ref ulong state) =>
        (Reference.Xoshiro256.SplitMix64(ref state) >> 11) * (1.0 / (1UL << 53));

    /// <summary>Bit i of the result is unit i: byte i/8, bit i%8 (the generated code's packed layout).</summary>
    public static byte[] Pack(ReadOnlySpan<byte> units)
    {
        var packed = new byte[(units.Length + 7) / 8];
        for (int i = 0; i < units.Length; i++)
            if (units[i] != 0) packed[i >> 3] |= (byte)(1 << (i & 7));
        return packed;
    }
}
