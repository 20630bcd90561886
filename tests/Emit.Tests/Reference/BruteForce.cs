using Emit.Model;

namespace Emit.Tests.Reference;

/// <summary>
/// An independent path to F(v) and log Z: enumerate every joint state and evaluate the energy straight from
/// its definition, −E(v,h) = b·v + c·h + Σ L v v + Σ v W h + Σ M h h, with no Gray codes and no closed forms.
/// </summary>
internal static class BruteForce
{
    public static double NegativeEnergy(BoltzmannModel m, byte[] v, byte[] h)
    {
        double e = 0;
        for (int i = 0; i < m.Visible; i++) e += m.VisibleBias[i] * v[i];
        for (int j = 0; j < m.Hidden; j++) e += m.HiddenBias[j] * h[j];
        foreach (var l in m.VisibleLinks) e += l.W * v[l.I] * v[l.J];
        foreach (var l in m.HiddenLinks) e += l.W * h[l.I] * h[l.J];
        for (int i = 0; i < m.Visible; i++)
            for (int j = 0; j < m.Hidden; j++) e += v[i] * m.Weight(i, j) * h[j];
        return e;
    }

    private static double LogSumExp(IEnumerable<double> xs)
    {
        var list = xs.ToList();
        double max = list.Max();
        return max + Math.Log(list.Sum(x => Math.Exp(x - max)));
    }

    public static double FreeEnergy(BoltzmannModel m, byte[] v) =>
        -LogSumExp(Enumerable.Range(0, 1 << m.Hidden).Select(hb => NegativeEnergy(m, v, TestModels.Bits(hb, m.Hidden))));

    public static double LogPartition(BoltzmannModel m) =>
        LogSumExp(Enumerable.Range(0, 1 << m.Visible).SelectMany(vb =>
            Enumerable.Range(0, 1 << m.Hidden).Select(hb => NegativeEnergy(m, TestModels.Bits(vb, m.Visible), TestModels.Bits(hb, m.Hidden)))));
}
