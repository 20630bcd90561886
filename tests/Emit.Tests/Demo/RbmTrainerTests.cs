using System.Collections.Immutable;
using Emit.Demo;
using Emit.Model;
using Emit.Tests.Reference;

namespace Emit.Tests.Demo;

public sealed class RbmTrainerTests
{
    private static readonly ImmutableArray<string> SixNames = ["a", "b", "c", "d", "e", "f"];

    /// <summary>Two prototypes, 111000 and 000111, each bit flipped with probability 0.1 (invented test data).</summary>
    private static List<ImmutableArray<byte>> TwoClusters(int rows, ulong seed)
    {
        var rng = new SplitMix64(seed);
        var list = new List<ImmutableArray<byte>>();
        for (int r = 0; r < rows; r++)
        {
            bool first = rng.Chance(0.5);
            var v = new byte[6];
            for (int i = 0; i < 6; i++)
            {
                bool on = (i < 3) == first;
                if (rng.Chance(0.1)) on = !on;
                v[i] = on ? (byte)1 : (byte)0;
            }
            list.Add(ImmutableArray.Create(v));
        }
        return list;
    }

    private static readonly RbmTrainerSettings Small = new() { Hidden = 3, Epochs = 60, Seed = 11 };

    // Training should raise the likelihood of the data well above what units without hidden structure can reach.
    // The log-likelihood is computed exactly by enumerating every joint state (BruteForce, an independent path);
    // the best model without hidden units is independent Bernoulli units at the data frequencies, whose average
    // log-likelihood is Σ_i p_i log p_i + (1-p_i) log(1-p_i) (maximum likelihood for a product of Bernoullis).
    // The model must also reproduce the sign of every pairwise covariance of the data (+ within a prototype's
    // units, - across). Exact marginals are not asserted: CD-k is a biased estimator whose short chains do not
    // balance well-separated modes (Carreira-Perpiñán and Hinton, "On contrastive divergence learning", AISTATS 2005).
    [Fact]
    public void Trained_model_fits_the_data_better_than_independent_units()
    {
        var data = TwoClusters(2000, 5);
        var model = RbmTrainer.Train(data, SixNames, Small).Model;

        double logZ = BruteForce.LogPartition(model);
        var p = new double[64];
        for (int s = 0; s < 64; s++) p[s] = Math.Exp(-BruteForce.FreeEnergy(model, TestModels.Bits(s, 6)) - logZ);
        Assert.Equal(1.0, p.Sum(), 9);

        double logLik = data.Average(v => -BruteForce.FreeEnergy(model, v.ToArray()) - logZ);
        double independent = 0;
        for (int i = 0; i < 6; i++)
        {
            double q = data.Average(v => (double)v[i]);
            independent += q * Math.Log(q) + (1 - q) * Math.Log(1 - q);
        }
        // The generating mixture's own average log-likelihood is about -2.6 nats; independent units reach about -4.15.
        Assert.True(logLik > independent + 1.0, $"RBM {logLik:F3} nats vs independent units {independent:F3}");

        double Mean(int i) => Enumerable.Range(0, 64).Where(s => ((s >> i) & 1) == 1).Sum(s => p[s]);
        for (int i = 0; i < 6; i++)
            for (int j = i + 1; j < 6; j++)
            {
                double both = Enumerable.Range(0, 64).Where(s => ((s >> i) & 1) == 1 && ((s >> j) & 1) == 1).Sum(s => p[s]);
                double cov = both - Mean(i) * Mean(j);
                bool samePrototype = (i < 3) == (j < 3);
                Assert.True(samePrototype ? cov > 0.05 : cov < -0.05, $"covariance of units {i},{j} is {cov:F3}");
            }

        var untrained = RbmTrainer.Train(data, SixNames, Small with { Epochs = 0 }).Model;
        double logZ0 = BruteForce.LogPartition(untrained);
        double logLik0 = data.Average(v => -BruteForce.FreeEnergy(untrained, v.ToArray()) - logZ0);
        Assert.True(logLik > logLik0 + 1.0, $"trained {logLik:F3} vs untrained {logLik0:F3}");
    }

    [Fact]
    public void Same_rows_and_settings_give_the_same_bits_and_the_seed_matters()
    {
        var data = TwoClusters(300, 6);
        var s = Small with { Epochs = 5 };
        var a = RbmTrainer.Train(data, SixNames, s);
        var b = RbmTrainer.Train(data, SixNames, s);
        Assert.Equal(ModelJson.ToText(a.Model), ModelJson.ToText(b.Model));
        Assert.Equal(a.ReconstructionError.ToArray(), b.ReconstructionError.ToArray());
        Assert.Equal(5, a.ReconstructionError.Length);
        var c = RbmTrainer.Train(data, SixNames, s with { Seed = 12 });
        Assert.NotEqual(a.Model.Sha256, c.Model.Sha256);
        Assert.Equal(ModelKind.Rbm, a.Model.Kind);
        Assert.Equal(SixNames.ToArray(), a.Model.Names.ToArray());
    }

    [Fact]
    public void Rejects_bad_inputs()
    {
        Assert.Throws<ArgumentException>(() => RbmTrainer.Train([], SixNames, Small));
        Assert.Throws<ArgumentException>(() => RbmTrainer.Train([ImmutableArray.Create<byte>(1, 0)], SixNames, Small));
        Assert.Throws<ArgumentException>(() => RbmTrainer.Train(TwoClusters(10, 1), SixNames, Small with { BatchSize = 0 }));
    }
}
