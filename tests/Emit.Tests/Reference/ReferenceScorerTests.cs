using System.Collections.Immutable;
using Emit.Model;
using Emit.Reference;

namespace Emit.Tests.Reference;

public sealed class ReferenceScorerTests
{
    private static void Close(double expected, double actual, double rel, string what) =>
        Assert.True(Math.Abs(expected - actual) <= rel * Math.Max(1.0, Math.Abs(expected)), $"{what}: expected {expected:R}, got {actual:R}");

    /// <summary>
    /// Worked example (common practice; no published source): 2 visible, 2 hidden, no biases, W(v1,h1) = 2,
    /// W(v2,h2) = 1, M(h1,h2) = −1. The 16 joint states' unnormalised probabilities sum to Z ≈ 39.7 and with
    /// all four units on −E = 2 + 1 − 1 = 2.
    /// </summary>
    [Fact]
    public void Worked_example_two_by_two_general_model()
    {
        var m = new BoltzmannModel(ModelKind.General, 2, 2, [0, 0], [0, 0], [2, 0, 0, 1],
            ImmutableArray<Link>.Empty, [new Link(0, 1, -1)]);
        Assert.Equal(2.0, BruteForce.NegativeEnergy(m, [1, 1], [1, 1]));
        var z = Math.Exp(ExactLogPartition.Compute(m).LogPartition);
        Assert.Equal(39.7, z, 1);
        // Z by hand: 4 + 2(1+e²) + 2(1+e) + e⁻¹(1+e²)(1+e).
        double e = Math.E;
        Close(4 + 2 * (1 + e * e) + 2 * (1 + e) + (1 + e * e) * (1 + e) / e, z, 1e-14, "Z");
        // F(all visible on) = −log Σ_h exp(2h1 + h2 − h1h2) = −log(1 + e² + e + e²).
        Close(-Math.Log(1 + 2 * e * e + e), new ReferenceScorer(m).FreeEnergy([1, 1]), 1e-15, "F(1,1)");
    }

    public static TheoryData<ModelKind, int, int> SmallShapes => new()
    {
        { ModelKind.Rbm, 5, 3 }, { ModelKind.Rbm, 3, 6 }, { ModelKind.Rbm, 4, 0 },
        { ModelKind.Lateral, 6, 3 }, { ModelKind.Lateral, 3, 5 },
        { ModelKind.General, 4, 4 }, { ModelKind.General, 6, 3 }, { ModelKind.General, 1, 1 },
    };

    [Theory]
    [MemberData(nameof(SmallShapes))]
    public void Free_energy_and_log_partition_match_brute_force_enumeration(ModelKind kind, int visible, int hidden)
    {
        for (int seed = 0; seed < 4; seed++)
        {
            var m = TestModels.Random(kind, visible, hidden, seed * 31 + visible, scale: 1.5, linkDensity: 0.5);
            var scorer = new ReferenceScorer(m);
            for (long vb = 0; vb < 1L << visible; vb++)
            {
                var v = TestModels.Bits(vb, visible);
                Close(BruteForce.FreeEnergy(m, v), scorer.FreeEnergy(v), 1e-12, $"F({vb}) {kind} seed {seed}");
            }
            Close(BruteForce.LogPartition(m), ExactLogPartition.Compute(m).LogPartition, 1e-12, $"log Z {kind} seed {seed}");
        }
    }

    /// <summary>Closed-form free energy written the obvious way (dense loops, log(1 + exp(x))).</summary>
    private static double Straightforward(BoltzmannModel m, byte[] v)
    {
        double f = 0;
        for (int i = 0; i < m.Visible; i++) f -= m.VisibleBias[i] * v[i];
        foreach (var l in m.VisibleLinks) f -= l.W * v[l.I] * v[l.J];
        for (int j = 0; j < m.Hidden; j++)
        {
            double x = m.HiddenBias[j];
            for (int i = 0; i < m.Visible; i++) x += v[i] * m.Weight(i, j);
            f -= Math.Log(1 + Math.Exp(x));
        }
        return f;
    }

    [Theory]
    [InlineData(ModelKind.Rbm, 120, 64, 0.3)]
    [InlineData(ModelKind.Lateral, 90, 33, 0.3)]
    [InlineData(ModelKind.Rbm, 784, 500, 0.05)]
    [InlineData(ModelKind.Rbm, 131, 13, 2.0)]
    public void Matches_a_straightforward_implementation_to_1e_12(ModelKind kind, int visible, int hidden, double scale)
    {
        var m = TestModels.Random(kind, visible, hidden, 7, scale: scale, linkDensity: 0.1);
        var scorer = new ReferenceScorer(m);
        var rng = new Random(3);
        int rows = 300;
        var units = new byte[rows * visible];
        for (int t = 0; t < rows; t++)
        {
            var v = TestModels.RandomUnits(visible, rng, p: rng.NextDouble());
            v.CopyTo(units, t * visible);
            Close(Straightforward(m, v), scorer.FreeEnergy(v), 1e-12, $"vector {t}");
        }
        var batch = new double[rows];
        scorer.FreeEnergies(units, rows, batch);
        for (int t = 0; t < rows; t++)
            Close(Straightforward(m, units.AsSpan(t * visible, visible).ToArray()), batch[t], 1e-12, $"batch {t}");
    }

    /// <summary>
    /// Runs <paramref name="work"/> on a scheduler that runs one task at a time: Parallel.For then uses one thread.
    /// </summary>
    private static T OneThread<T>(Func<T> work)
    {
        var one = new ConcurrentExclusiveSchedulerPair(TaskScheduler.Default, 1).ExclusiveScheduler;
        return Task.Factory.StartNew(work, CancellationToken.None, TaskCreationOptions.None, one)
            .GetAwaiter().GetResult();
    }

    [Theory]
    [InlineData(ModelKind.Rbm, 784, 500)]
    [InlineData(ModelKind.Lateral, 70, 37)]
    [InlineData(ModelKind.General, 30, 9)]
    public void Batch_scoring_has_the_same_bits_on_one_thread_and_on_all(ModelKind kind, int visible, int hidden)
    {
        var m = TestModels.Random(kind, visible, hidden, 12, scale: 0.1, linkDensity: 0.1);
        var scorer = new ReferenceScorer(m);
        var rng = new Random(6);
        int rows = 3000;
        var units = new byte[rows * visible];
        for (int k = 0; k < units.Length; k++) units[k] = (byte)(rng.NextDouble() < 0.13 ? 1 : 0);
        var all = new double[rows];
        scorer.FreeEnergies(units, rows, all);
        var single = OneThread(() =>
        {
            var r = new double[rows];
            scorer.FreeEnergies(units, rows, r);
            return r;
        });
        Assert.Equal(all.Select(BitConverter.DoubleToInt64Bits), single.Select(BitConverter.DoubleToInt64Bits));
    }

    [Fact]
    public void Exact_log_partition_has_the_same_bits_on_one_thread_and_on_all()
    {
        var m = TestModels.Random(ModelKind.Rbm, 200, 17, 13, scale: 0.2);
        double all = ExactLogPartition.Compute(m).LogPartition;
        double single = OneThread(() => ExactLogPartition.Compute(m).LogPartition);
        Assert.Equal(BitConverter.DoubleToInt64Bits(all), BitConverter.DoubleToInt64Bits(single));
    }

    /// <summary>
    /// log Z of an rbm written the obvious way: for each hidden state h, log Σ_v exp(−E) = c·h + Σ_i log(1 +
    /// exp(b_i + Σ_j W_ij h_j)), then a max-shifted log-sum-exp over the 2^hidden states.
    /// </summary>
    [Fact]
    public void Exact_log_partition_matches_a_straightforward_sum_to_1e_12()
    {
        var m = TestModels.Random(ModelKind.Rbm, 61, 11, 21, scale: 0.8);
        var terms = new double[1 << 11];
        for (int hb = 0; hb < terms.Length; hb++)
        {
            double t = 0;
            for (int j = 0; j < 11; j++) t += ((hb >> j) & 1) * m.HiddenBias[j];
            for (int i = 0; i < 61; i++)
            {
                double x = m.VisibleBias[i];
                for (int j = 0; j < 11; j++) x += ((hb >> j) & 1) * m.Weight(i, j);
                t += Math.Log(1 + Math.Exp(x));
            }
            terms[hb] = t;
        }
        double max = terms.Max();
        double expected = max + Math.Log(terms.Sum(x => Math.Exp(x - max)));
        Close(expected, ExactLogPartition.Compute(m).LogPartition, 1e-12, "log Z");
    }

    [Fact]
    public void Batch_scoring_gives_the_same_bits_as_one_by_one()
    {
        var m = TestModels.Random(ModelKind.Lateral, 40, 17, 5);
        var scorer = new ReferenceScorer(m);
        var rng = new Random(9);
        int rows = 1000;
        var units = new byte[rows * 40];
        for (int k = 0; k < units.Length; k++) units[k] = (byte)(rng.Next(8) == 0 ? 1 : 0);
        var batch = new double[rows];
        scorer.FreeEnergies(units, rows, batch);
        for (int r = 0; r < rows; r++)
            Assert.Equal(BitConverter.DoubleToInt64Bits(scorer.FreeEnergy(units.AsSpan(r * 40, 40))), BitConverter.DoubleToInt64Bits(batch[r]));
    }

    [Fact]
    public void Log_partition_has_the_same_bits_serial_and_parallel()
    {
        var m = TestModels.Random(ModelKind.Rbm, 60, 18, 11);
        var plain = ExactLogPartition.Compute(m).LogPartition;
        // Serial: the same blocks, one thread, through the internal enumerator.
        var rows = new double[18 * 60];
        for (int i = 0; i < 60; i++) for (int j = 0; j < 18; j++) rows[j * 60 + i] = m.Weight(i, j);
        var serial = new GrayCodeSum(m.HiddenBias.ToArray(), null, rows, m.VisibleBias.ToArray()).LogSumExp(parallel: false);
        Assert.Equal(BitConverter.DoubleToInt64Bits(serial), BitConverter.DoubleToInt64Bits(plain));
    }

    [Fact]
    public void Rbm_log_partition_is_the_same_summed_over_either_layer()
    {
        // Summing over hidden (the smaller layer) and over visible (a transposed copy) must agree.
        var m = TestModels.Random(ModelKind.Rbm, 16, 12, 2);
        var t = new BoltzmannModel(ModelKind.Rbm, 12, 16, m.HiddenBias, m.VisibleBias,
            Enumerable.Range(0, 12 * 16).Select(k => m.Weight(k % 16, k / 16)).ToImmutableArray());
        Close(ExactLogPartition.Compute(m).LogPartition, ExactLogPartition.Compute(t).LogPartition, 1e-12, "log Z");
    }

    [Fact]
    public void Refuses_models_too_large_to_enumerate()
    {
        var m = TestModels.Random(ModelKind.Lateral, 29, 2, 1, linkDensity: 0.05);
        var e = Assert.Throws<EmitException>(() => ExactLogPartition.Compute(m));
        Assert.Contains("2^29", e.Problem);
        Assert.Contains("ais", e.Hint);
    }
}
