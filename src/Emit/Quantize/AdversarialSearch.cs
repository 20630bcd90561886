using Emit.Reference;

namespace Emit.Quantize;

/// <summary>
/// Looks for inputs where the fixed-point scorer is furthest from the double reference, to measure how tight the
/// stated bound is. Starts: all off, all on, and for every hidden unit j the inputs that maximise and minimise its
/// rounding error δ_j (v_i = 1 exactly where the rounded weight is above, resp. below, the real one) and its
/// pre-activation. From each start, greedy bit flips (first improvement, units in order, repeated passes) push the
/// signed error (fixed − exact) up and, separately, down.
/// </summary>
public static class AdversarialSearch
{
    /// <summary>
    /// The start vectors, in order: all off, all on, then per hidden unit j the inputs that maximise and minimise its
    /// weight-rounding error and its pre-activation.
    /// </summary>
    public static List<byte[]> StartingVectors(FixedPointPlan plan)
    {
        var model = plan.Model;
        int v = model.Visible, h = model.Hidden;
        var starts = new List<byte[]> { new byte[v], Enumerable.Repeat((byte)1, v).ToArray() };
        for (int j = 0; j < h; j++)
        {
            double scale = Math.ScaleB(1.0, -plan.Units[j].FractionBits);
            var up = new byte[v];
            var down = new byte[v];
            for (int i = 0; i < v; i++)
            {
                double d = plan.Weights[i * h + j] * scale - model.Weight(i, j);
                up[i] = d > 0 ? (byte)1 : (byte)0;
                down[i] = d < 0 ? (byte)1 : (byte)0;
            }
            starts.Add(up);
            starts.Add(down);
            starts.Add(plan.Ranges.MaximisingVector(j));
            starts.Add(plan.Ranges.MinimisingVector(j));
        }
        return starts;
    }

    /// <summary>Runs the search; <paramref name="maxStarts"/> limits the start vectors (in the order above).</summary>
    public static AdversarialResult Run(FixedPointPlan plan, int maxStarts = int.MaxValue, int maxPasses = 8)
    {
        var model = plan.Model;
        var sim = new FixedPointSimulator(plan);
        var reference = new ReferenceScorer(model);
        int v = model.Visible, h = model.Hidden;
        double Error(byte[] u) => sim.FreeEnergy(u) / sim.Scale - reference.FreeEnergy(u);

        var starts = StartingVectors(plan);

        double best = 0;
        byte[] bestVector = new byte[v];
        int evaluations = 0;
        foreach (var start in starts.Take(maxStarts))
        {
            foreach (int sign in new[] { 1, -1 })
            {
                var u = (byte[])start.Clone();
                double current = sign * Error(u);
                evaluations++;
                for (int pass = 0; pass < maxPasses; pass++)
                {
                    bool improved = false;
                    for (int i = 0; i < v; i++)
                    {
                        u[i] ^= 1;
                        double e = sign * Error(u);
                        evaluations++;
                        if (e > current)
                        {
                            current = e;
                            improved = true;
                        }
                        else u[i] ^= 1;
                    }
                    if (!improved) break;
                }
                if (current > best)
                {
                    best = current;
                    bestVector = (byte[])u.Clone();
                }
            }
        }
        return new AdversarialResult(plan.ErrorBound, best, bestVector, evaluations);
    }
}
