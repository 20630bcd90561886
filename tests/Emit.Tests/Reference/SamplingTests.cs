using Emit.Model;
using Emit.Reference;

namespace Emit.Tests.Reference;

public sealed class SamplingTests
{
    [Theory]
    [InlineData(ModelKind.Rbm)]
    [InlineData(ModelKind.Lateral)]
    [InlineData(ModelKind.General)]
    public void Gibbs_samples_follow_the_model_distribution(ModelKind kind)
    {
        // p(v) = exp(−F(v) − log Z), with F and Z from brute-force enumeration of the energy.
        var m = TestModels.Random(kind, 4, 3, 17, scale: 1.0, linkDensity: 0.6);
        double logZ = BruteForce.LogPartition(m);
        var chain = new GibbsChain(m);
        var rng = new Xoshiro256(5);
        var v = new byte[4];
        var h = new byte[3];
        chain.SampleBase(v, h, rng);
        var counts = new int[16];
        const int burnIn = 100, samples = 200_000;
        for (int t = 0; t < burnIn + samples; t++)
        {
            chain.Sweep(v, h, 1.0, rng);
            if (t >= burnIn) counts[v[0] | v[1] << 1 | v[2] << 2 | v[3] << 3]++;
        }
        double tv = 0;
        for (int s = 0; s < 16; s++)
            tv += Math.Abs((double)counts[s] / samples - Math.Exp(-BruteForce.FreeEnergy(m, TestModels.Bits(s, 4)) - logZ));
        Assert.True(tv / 2 < 0.01, $"total variation {tv / 2}");
    }

    [Theory]
    [InlineData(ModelKind.Rbm, 14, 9)]
    [InlineData(ModelKind.Lateral, 12, 6)]
    [InlineData(ModelKind.General, 10, 8)]
    public void Ais_agrees_with_exact_enumeration_within_its_error(ModelKind kind, int visible, int hidden)
    {
        var m = TestModels.Random(kind, visible, hidden, 23, scale: 0.5, linkDensity: 0.2);
        double exact = ExactLogPartition.Compute(m).LogPartition;
        var ais = AisLogPartition.Estimate(m, new AisOptions(Chains: 200, Steps: 1000, Seed: 3));
        Assert.True(ais.Stderr > 0 && ais.Stderr < 0.05, $"stderr {ais.Stderr}");
        Assert.True(Math.Abs(ais.LogPartition - exact) <= 5 * ais.Stderr + 0.01,
            $"AIS {ais.LogPartition} ± {ais.Stderr}, exact {exact}");
    }

    [Fact]
    public void Ais_is_deterministic_for_a_seed()
    {
        var m = TestModels.Random(ModelKind.Rbm, 10, 5, 2);
        var a = AisLogPartition.Estimate(m, new AisOptions(16, 50, 9));
        var b = AisLogPartition.Estimate(m, new AisOptions(16, 50, 9));
        var c = AisLogPartition.Estimate(m, new AisOptions(16, 50, 10));
        Assert.Equal(a.LogPartition, b.LogPartition);
        Assert.NotEqual(a.LogPartition, c.LogPartition);
    }

    // SplitMix64 reference outputs for seed 0 (the first values of the generator's published C code,
    // splitmix64.c by Vigna; from memory of its commonly quoted test output).
    [Fact]
    public void SplitMix64_matches_reference_outputs()
    {
        ulong x = 0;
        Assert.Equal(0xE220A8397B1DCDAFUL, Xoshiro256.SplitMix64(ref x));
        Assert.Equal(0x6E789E6AA1B965F4UL, Xoshiro256.SplitMix64(ref x));
        Assert.Equal(0x06C45D188009454FUL, Xoshiro256.SplitMix64(ref x));
    }
}
