using System.Diagnostics;
using System.Globalization;
using Emit.Reference;

/// <summary>
/// Where the reference scorer's time goes, one thread, 784×500 with 13 % of bits on: the whole free energy, then
/// its two parts separately (adding the active weight rows to the hidden pre-activations; the 500 softplus terms,
/// through libm's exp and log and through the vector code). Best of 5 rounds after a warm-up round.
/// </summary>
internal static class Profile
{
    private const int V = 784, H = 500, Rows = 4000;

    public static int Run()
    {
        var inv = CultureInfo.InvariantCulture;
        var model = BenchModels.RandomRbm(V, H, 1, 0.05);
        var units = BenchModels.RandomUnits(Rows, V, 2, 0.13);
        var scorer = new ReferenceScorer(model);
        var w = model.Weights.ToArray();
        var c = model.HiddenBias.ToArray();
        var pre = new double[Rows * H];
        double sink = 0;

        void Time(string name, Action round)
        {
            round();
            double best = double.MaxValue;
            for (int rep = 0; rep < 5; rep++)
            {
                var sw = Stopwatch.StartNew();
                round();
                best = Math.Min(best, sw.Elapsed.TotalSeconds);
            }
            Console.WriteLine($"{name,-34} {(best / Rows * 1e9).ToString("F0", inv),8} ns/vector");
        }

        Time("free energy (ReferenceScorer)", () =>
        {
            for (int r = 0; r < Rows; r++) sink += scorer.FreeEnergy(units.AsSpan(r * V, V));
        });
        Time("row additions only", () =>
        {
            for (int r = 0; r < Rows; r++)
            {
                var acc = pre.AsSpan(r * H, H);
                c.CopyTo(acc);
                for (int i = 0; i < V; i++)
                    if (units[r * V + i] != 0)
                        System.Numerics.Tensors.TensorPrimitives.Add(acc, w.AsSpan(i * H, H), acc);
            }
        });
        Time("softplus sum, libm (Softplus.Of)", () =>
        {
            for (int r = 0; r < Rows; r++)
            {
                double s = 0;
                foreach (double x in pre.AsSpan(r * H, H)) s += Softplus.Of(x);
                sink += s;
            }
        });
        Time("softplus sum, VectorSoftplus.Sum", () =>
        {
            for (int r = 0; r < Rows; r++) sink += VectorSoftplus.Sum(pre.AsSpan(r * H, H));
        });
        Console.WriteLine($"(checksum {sink.ToString("G6", inv)})");
        return 0;
    }
}
