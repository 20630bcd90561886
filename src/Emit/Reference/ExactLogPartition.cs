using System.Diagnostics;
using Emit.Model;

namespace Emit.Reference;

/// <summary>What an exact log Z computation found.</summary>
public sealed record LogPartitionResult(double LogPartition, long States, double Seconds, string Enumerated);

/// <summary>
/// Exact log Z by enumeration: rbm sums over the smaller layer (&lt;= 32 units) with the other layer in closed
/// form; lateral over the visible layer (&lt;= 28) with the hidden layer in closed form; general over all units
/// (visible + hidden &lt;= 30).
/// </summary>
public static class ExactLogPartition
{
    /// <summary>rbm: the largest smaller layer summed over.</summary>
    public const int MaxRbmLayer = 32;
    /// <summary>lateral: the largest visible layer summed over.</summary>
    public const int MaxLateralVisible = 28;
    /// <summary>general: the most units (visible + hidden) summed over.</summary>
    public const int MaxGeneralUnits = 30;

    /// <summary>Number of states the exact sum visits, or throws with the reason it is refused.</summary>
    public static long States(BoltzmannModel model) => 1L << Plan(model).EnumeratedUnits;

    /// <summary>Seconds the computation is expected to take on this machine, from timing a few blocks.</summary>
    public static double EstimateSeconds(BoltzmannModel model)
    {
        var plan = Plan(model);
        var sum = plan.Build();
        int sample = (int)Math.Min(sum.Blocks, 4);
        var sw = Stopwatch.StartNew();
        sum.Sample(sample);
        double perBlock = sw.Elapsed.TotalSeconds / sample;
        return perBlock * sum.Blocks / Math.Max(1, Environment.ProcessorCount);
    }

    /// <summary>
    /// Exact log Z of <paramref name="model"/>; throws if the model is too large (see <see cref="States"/>).
    /// </summary>
    public static LogPartitionResult Compute(BoltzmannModel model, IProgress<long>? progress = null,
        CancellationToken cancel = default)
    {
        var plan = Plan(model);
        var sw = Stopwatch.StartNew();
        var sum = plan.Build();
        double logZ = plan.Offset + sum.LogSumExp(parallel: true, progress, cancel);
        return new LogPartitionResult(logZ, sum.States, sw.Elapsed.TotalSeconds, plan.Description);
    }

    private sealed record EnumerationPlan(int EnumeratedUnits, string Description, Func<GrayCodeSum> Build,
        double Offset = 0);

    private static EmitException TooLarge(string what, int units, int limit) =>
        new($"exact log Z would enumerate 2^{units} {what} states, more than the 2^{limit} allowed",
            $"use {Setting.Method.Ref()} ais, the sampling estimate, for a model this size");

    private static EnumerationPlan Plan(BoltzmannModel m)
    {
        int v = m.Visible, h = m.Hidden;
        switch (m.Kind)
        {
            case ModelKind.Rbm when h <= v:
                if (h > MaxRbmLayer) throw TooLarge("hidden", h, MaxRbmLayer);
                return new(h, $"2^{h} hidden states", () =>
                {
                    var rows = new double[h * v]; // hidden j's row: W_ij over i
                    for (int i = 0; i < v; i++)
                        for (int j = 0; j < h; j++) rows[j * v + i] = m.Weight(i, j);
                    return new GrayCodeSum(m.HiddenBias.ToArray(), null, rows, m.VisibleBias.ToArray());
                });
            case ModelKind.Rbm:
                if (v > MaxRbmLayer) throw TooLarge("visible", v, MaxRbmLayer);
                return new(v, $"2^{v} visible states", () =>
                    new GrayCodeSum(m.VisibleBias.ToArray(), null, m.Weights.ToArray(), m.HiddenBias.ToArray()));
            case ModelKind.Lateral:
                if (v > MaxLateralVisible) throw TooLarge("visible", v, MaxLateralVisible);
                return new(v, $"2^{v} visible states", () =>
                {
                    var pairs = new double[v * v];
                    foreach (var l in m.VisibleLinks) { pairs[l.I * v + l.J] = l.W; pairs[l.J * v + l.I] = l.W; }
                    return new GrayCodeSum(m.VisibleBias.ToArray(), pairs, m.Weights.ToArray(), m.HiddenBias.ToArray());
                });
            default:
                int n = v + h;
                if (n > MaxGeneralUnits) throw TooLarge("joint", n, MaxGeneralUnits);
                return new(n, $"2^{n} joint states", () =>
                {
                    var a = new double[n];
                    m.VisibleBias.CopyTo(a, 0);
                    m.HiddenBias.CopyTo(a, v);
                    var pairs = new double[n * n];
                    void Set(int x, int y, double w) { pairs[x * n + y] = w; pairs[y * n + x] = w; }
                    foreach (var l in m.VisibleLinks) Set(l.I, l.J, l.W);
                    foreach (var l in m.HiddenLinks) Set(v + l.I, v + l.J, l.W);
                    for (int i = 0; i < v; i++)
                        for (int j = 0; j < h; j++) Set(i, v + j, m.Weight(i, j));
                    return new GrayCodeSum(a, pairs, [], []);
                });
        }
    }
}
