using Emit.Detection;
using Emit.Model;
using Emit.Tests.Reference;

namespace Emit.Tests.Detection;

/// <summary>
/// ΔF_i = F(v with unit i flipped) − F(v) against brute force: both free energies enumerated over every hidden state
/// straight from the energy's definition (<see cref="BruteForce"/>), for every kind of model.
/// </summary>
public sealed class UnitFlipExplainerTests
{
    [Theory]
    [InlineData(ModelKind.Rbm, 9, 6, 1)]
    [InlineData(ModelKind.Rbm, 12, 0, 2)]
    [InlineData(ModelKind.Lateral, 10, 5, 3)]
    [InlineData(ModelKind.Lateral, 7, 8, 4)]
    [InlineData(ModelKind.General, 8, 5, 5)]
    [InlineData(ModelKind.General, 6, 7, 6)]
    public void Every_delta_matches_brute_force_flipping(ModelKind kind, int visible, int hidden, int seed)
    {
        var model = TestModels.Random(kind, visible, hidden, seed, scale: 0.9, linkDensity: 0.5);
        var explainer = new UnitFlipExplainer(model);
        var rng = new Random(seed);
        for (int trial = 0; trial < 12; trial++)
        {
            var v = TestModels.RandomUnits(visible, rng);
            double f = BruteForce.FreeEnergy(model, v);
            var d = explainer.Deltas(v);
            for (int i = 0; i < visible; i++)
            {
                var flipped = (byte[])v.Clone();
                flipped[i] ^= 1;
                double expected = BruteForce.FreeEnergy(model, flipped) - f;
                Assert.True(Math.Abs(expected - d[i]) <= 1e-10 * (1 + Math.Abs(f)), $"unit {i}: expected {expected:R}, got {d[i]:R}");
            }
        }
    }

    [Fact]
    public void Top_lists_the_most_negative_first_and_breaks_ties_by_unit()
    {
        // No hidden units, no links: F(v) = -b·v, so flipping unit i changes F by -b_i when it turns on, +b_i when off.
        var model = new BoltzmannModel(ModelKind.Rbm, 4, 0, [1.0, 3.0, -2.0, 3.0], [], []);
        var top = new UnitFlipExplainer(model).Top([0, 0, 1, 0], 3);
        Assert.Equal([new UnitFlip(1, -3), new UnitFlip(3, -3), new UnitFlip(2, -2)], top);
        Assert.Equal(4, new UnitFlipExplainer(model).Top([0, 0, 1, 0], 10).Count);
    }
}
