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

        var names = new List<string>();
        var rounds = new List<Action>();
        void Time(string name, Action round) { names.Add(name); rounds.Add(round); }

        Time("free energy (ReferenceScorer)", () =>
        {
            for (int r = 0; r < Rows; r++) sink += scorer.FreeEnergy(units.AsSpan(r * V, V));
        });
        var batch = new double[Rows];
        var one = new ConcurrentExclusiveSchedulerPair(TaskScheduler.Default, 1).ExclusiveScheduler;
        Time("free energies, batch, 1 thread", () =>
            {
                Task.Factory.StartNew(() => scorer.FreeEnergies(units, Rows, batch), CancellationToken.None,
                    TaskCreationOptions.None, one).Wait();
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
        // Rounds interleaved (each part once per pass, best of the passes), so load from other processes on the
        // machine hits every part alike.
        var best = new double[rounds.Count];
        Array.Fill(best, double.MaxValue);
        for (int pass = 0; pass < 8; pass++)
            for (int k = 0; k < rounds.Count; k++)
            {
                var sw = Stopwatch.StartNew();
                rounds[k]();
                if (pass > 0) best[k] = Math.Min(best[k], sw.Elapsed.TotalSeconds);
            }
        for (int k = 0; k < rounds.Count; k++)
            Console.WriteLine($"{names[k],-36} {(best[k] / Rows * 1e9).ToString("F0", inv),8} ns/vector");
        Console.WriteLine($"(checksum {sink.ToString("G6", inv)})");
        return 0;
    }
}
