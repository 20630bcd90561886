using System.Collections.Immutable;
using Emit.Training;
using Emit.Model;
using Emit.Tests.Reference;

namespace Emit.Tests.Training;

public sealed class TrainerTests
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

    private static readonly TrainerSettings Small = new() { Hidden = 3, Epochs = 60, Seed = 11 };

    private static TrainingData Rows(List<ImmutableArray<byte>> rows) => TrainingData.FromRows(rows, SixNames, "two-clusters");

    private static BoltzmannModel Train(List<ImmutableArray<byte>> rows, TrainerSettings s) => Trainer.Train(Rows(rows), s).Model;

    // Training should raise the likelihood of the data well above what units without hidden structure can reach.
    // The log-likelihood is computed exactly by enumerating every joint state (BruteForce, an independent path);
    // the best model without hidden units is independent Bernoulli units at the data frequencies, whose average
    // log-likelihood is Σ_i p_i log p_i + (1-p_i) log(1-p_i) (maximum likelihood for a product of Bernoullis).
    // The model must also reproduce the sign of every pairwise covariance of the data (+ within a prototype's
    // units, - across). Exact marginals are not asserted: CD-k is a biased estimator whose short chains do not
    // balance well-separated modes (Carreira-Perpiñán and Hinton, "On contrastive divergence learning", AISTATS 2005).
    [Theory]
    [InlineData(ModelKind.Rbm, TrainingMethod.Pcd)]
    [InlineData(ModelKind.Rbm, TrainingMethod.Cd)]
    [InlineData(ModelKind.Lateral, TrainingMethod.Pcd)]
    [InlineData(ModelKind.General, TrainingMethod.Pcd)]
    [InlineData(ModelKind.General, TrainingMethod.Cd)]
    public void Trained_model_fits_the_data_better_than_independent_units(ModelKind kind, TrainingMethod method)
    {
        var data = TwoClusters(2000, 5);
        var model = Train(data, Small with { Kind = kind, Method = method });
        Assert.Equal(kind, model.Kind);

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

        var untrained = Train(data, Small with { Kind = kind, Epochs = 0 });
        double logZ0 = BruteForce.LogPartition(untrained);
        double logLik0 = data.Average(v => -BruteForce.FreeEnergy(untrained, v.ToArray()) - logZ0);
        Assert.True(logLik > logLik0 + 1.0, $"trained {logLik:F3} vs untrained {logLik0:F3}");
    }

    [Fact]
    public void Same_rows_and_settings_give_the_same_bits_and_the_seed_matters()
    {
        var data = Rows(TwoClusters(300, 6));
        var s = Small with { Epochs = 5 };
        var a = Trainer.Train(data, s);
        var b = Trainer.Train(data, s);
        Assert.Equal(ModelJson.ToText(a.Model), ModelJson.ToText(b.Model));
        Assert.Equal(a.Epochs.Select(e => e.ReconstructionError), b.Epochs.Select(e => e.ReconstructionError));
        Assert.Equal(5, a.Epochs.Length);
        var c = Trainer.Train(data, s with { Seed = 12 });
        Assert.NotEqual(a.Model.Sha256, c.Model.Sha256);
        Assert.Equal(ModelKind.Rbm, a.Model.Kind);
        Assert.Equal(SixNames.ToArray(), a.Model.Names.ToArray());
    }

    /// <summary>Work is split over threads by batch slot and visible unit, never inside a sum: the bits must not change.
    /// The model is large enough (50 slots × 40 × 30) that the parallel loops do run on several threads.</summary>
    [Theory]
    [InlineData(ModelKind.Rbm)]
    [InlineData(ModelKind.Lateral)]
    public void Thread_count_does_not_change_the_model(ModelKind kind)
    {
        var rng = new SplitMix64(8);
        var rows = Enumerable.Range(0, 200).Select(_ => Enumerable.Range(0, 40).Select(i => rng.Chance(i % 3 == 0 ? 0.7 : 0.2) ? (byte)1 : (byte)0).ToImmutableArray()).ToList();
        var data = TrainingData.FromRows(rows, default, "random");
        var s = new TrainerSettings { Kind = kind, Hidden = 30, BatchSize = 50, Epochs = 3, Seed = 4 };
        var one = Trainer.Train(data, s with { Threads = 1 }).Model;
        var four = Trainer.Train(data, s with { Threads = 4 }).Model;
        Assert.Equal(ModelJson.ToText(one), ModelJson.ToText(four));
    }

    /// <summary>
    /// The same with layers wider than a column block of the batch products (150 visible × 140 hidden, blocks of 64
    /// columns), so the products, the chunked update and the reconstruction figure all run on several threads; CD-2
    /// and a last batch shorter than the others included.
    /// </summary>
    [Theory]
    [InlineData(TrainingMethod.Pcd, 1)]
    [InlineData(TrainingMethod.Cd, 2)]
    public void Thread_count_does_not_change_a_wide_model(TrainingMethod method, int steps)
    {
        var rng = new SplitMix64(9);
        var rows = Enumerable.Range(0, 290).Select(_ => Enumerable.Range(0, 150)
            .Select(i => rng.Chance(i % 4 == 0 ? 0.6 : 0.15) ? (byte)1 : (byte)0).ToImmutableArray()).ToList();
        var data = TrainingData.FromRows(rows, default, "random");
        var s = new TrainerSettings { Hidden = 140, BatchSize = 40, Epochs = 2, Seed = 6, Method = method, GibbsSteps = steps };
        var one = Trainer.Train(data, s with { Threads = 1 });
        var two = Trainer.Train(data, s with { Threads = 2 });
        var three = Trainer.Train(data, s with { Threads = 3 });
        Assert.Equal(ModelJson.ToText(one.Model), ModelJson.ToText(two.Model));
        Assert.Equal(ModelJson.ToText(one.Model), ModelJson.ToText(three.Model));
        Assert.Equal(one.Epochs.Select(e => e.ReconstructionError), three.Epochs.Select(e => e.ReconstructionError));
    }

    /// <summary>
    /// Whether a loop runs on one thread or several is chosen by its amount of work: a model of the small speed
    /// benchmark's shape (64 visible × 16 hidden, batch 10; random rows with about a third of the units on) runs
    /// every loop on the calling thread even with two threads allowed, a wide one splits loops; and splitting every
    /// loop that has two items or more (a threshold of zero) gives the same model and figures as one thread, for
    /// rbm and lateral models, CD and PCD.
    /// </summary>
    [Theory]
    [InlineData(ModelKind.Rbm, TrainingMethod.Pcd)]
    [InlineData(ModelKind.Rbm, TrainingMethod.Cd)]
    [InlineData(ModelKind.Lateral, TrainingMethod.Pcd)]
    public void The_thread_choice_follows_the_work_and_never_changes_the_model(ModelKind kind, TrainingMethod method)
    {
        var rng = new SplitMix64(10);
        var rows = Enumerable.Range(0, 237).Select(_ => Enumerable.Range(0, 64)
            .Select(i => rng.Chance(i % 5 == 0 ? 0.6 : 0.25) ? (byte)1 : (byte)0).ToImmutableArray()).ToList();
        var data = TrainingData.FromRows(rows, default, "random");
        var s = new TrainerSettings { Kind = kind, Method = method, Hidden = 16, BatchSize = 10, Epochs = 3, Seed = 3 };
        (BoltzmannModel Model, ImmutableArray<EpochReport> Epochs, int Split) Run(TrainerSettings t)
        {
            using var run = new TrainingRun(data, null, t);
            var r = run.Execute(null, default);
            return (r.Model, r.Epochs, run.ParallelLoops);
        }
        var one = Run(s with { Threads = 1 });
        var two = Run(s with { Threads = 2 });
        var forced = Run(s with { Threads = 2, ParallelWork = 0 });
        var forcedThree = Run(s with { Threads = 3, ParallelWork = 0 });
        Assert.Equal(0, two.Split);
        Assert.True(forced.Split >= 3 * 24, $"{forced.Split} loops split"); // at least one per batch
        foreach (var other in new[] { two, forced, forcedThree })
        {
            Assert.Equal(ModelJson.ToText(one.Model), ModelJson.ToText(other.Model));
            Assert.Equal(one.Epochs.Select(e => e.ReconstructionError), other.Epochs.Select(e => e.ReconstructionError));
        }

        // 784 visible × 200 hidden, batch 50: the batch products, the update and the reconstruction figure are split.
        var wideRows = Enumerable.Range(0, 100).Select(_ => Enumerable.Range(0, 784)
            .Select(i => rng.Chance(0.2) ? (byte)1 : (byte)0).ToImmutableArray()).ToList();
        using var wide = new TrainingRun(TrainingData.FromRows(wideRows, default, "random"), null,
            new TrainerSettings { Hidden = 200, BatchSize = 50, Epochs = 1, Threads = 2 });
        wide.Execute(null, default);
        Assert.True(wide.ParallelLoops > 0, "a wide model's loops are split over threads");
    }

    [Fact]
    public void With_validation_rows_the_best_epoch_is_kept_and_training_stops_after_the_patience()
    {
        var train = Rows(TwoClusters(400, 1));
        var validation = TrainingData.FromRows(TwoClusters(200, 2), SixNames, "validation");
        var s = Small with { Epochs = 40, Patience = 3, LearningRate = 0.3, DecayLearningRate = false, Momentum = 0.9 };
        var r = Trainer.Train(train, s, validation);
        var best = r.Epochs.MaxBy(e => e.ValidationLogLikelihood!.Value)!;
        Assert.Equal(best.Epoch, r.EpochKept);
        Assert.True(r.Epochs.Length == 40 || r.Epochs.Length == r.EpochKept + 3, $"{r.Epochs.Length} epochs, kept {r.EpochKept}");
        // The kept model's exact validation log-likelihood (independent brute-force enumeration) is the reported figure.
        double logZ = BruteForce.LogPartition(r.Model);
        double ll = Enumerable.Range(0, validation.Rows).Average(k => -BruteForce.FreeEnergy(r.Model, validation.Row(k).ToArray()) - logZ);
        Assert.Equal(ll, best.ValidationLogLikelihood!.Value, 9);
    }

    [Fact]
    public void A_cancelled_token_stops_before_the_next_batch()
    {
        using var cts = new CancellationTokenSource();
        int epochs = 0;
        Assert.ThrowsAny<OperationCanceledException>(() => Trainer.Train(Rows(TwoClusters(300, 6)), Small, null, _ =>
        {
            if (++epochs == 2) cts.Cancel();
        }, cts.Token));
        Assert.Equal(2, epochs);
    }

    [Fact]
    public void Constant_units_are_reported_and_their_bias_is_clipped()
    {
        var rows = TwoClusters(100, 3).Select(r => r.SetItem(2, 0).SetItem(4, 1)).ToList();
        var r = Trainer.Train(Rows(rows), Small with { Epochs = 0 });
        Assert.Equal([2, 4], r.ConstantUnits.ToArray());
        Assert.Equal(Math.Log(0.001 / 0.999), r.Model.VisibleBias[2], 12);
        Assert.Equal(Math.Log(0.999 / 0.001), r.Model.VisibleBias[4], 12);
    }

    [Fact]
    public void Rejects_bad_inputs_with_emit_errors()
    {
        Assert.Throws<EmitException>(() => TrainingData.FromRows([], SixNames, "x"));
        Assert.Throws<EmitException>(() => TrainingData.FromRows([ImmutableArray.Create<byte>(1, 0), ImmutableArray.Create<byte>(1)], default, "x"));
        var data = Rows(TwoClusters(10, 1));
        Assert.Throws<EmitException>(() => Trainer.Train(data, Small with { BatchSize = 0 }));
        Assert.Throws<EmitException>(() => Trainer.Train(data, Small with { BatchSize = 11 }));
        Assert.Throws<EmitException>(() => Trainer.Train(data, Small with { LearningRate = double.NaN }));
        Assert.Throws<EmitException>(() => Trainer.Train(data, Small with { Kind = ModelKind.General, Hidden = 17 }));
    }
}
