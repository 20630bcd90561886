using System.Diagnostics;
using System.Globalization;
using System.Text;
using Emit.Model;
using Emit.Reference;

// Benchmarks for the reference stage. Usage: dotnet run -c Release --project bench/Emit.Bench -- reference OUTDIR
// Writes OUTDIR/model-784x500.json and OUTDIR/vectors.csv (for bench/numpy_reference.py, which times numpy on the
// same files), OUTDIR/reference-free-energy.txt and OUTDIR/reference-timing.txt (vectors/s, which the numpy script
// divides by its own figure), then prints the figures. `Emit.Bench profile` times the scorer's parts.
if (args.Length == 1 && args[0] == "profile") return Profile.Run();
if (args.Length < 2 || args[0] != "reference")
{
    Console.Error.WriteLine("usage: Emit.Bench reference OUTDIR | Emit.Bench profile");
    return 2;
}
string dir = args[1];
Directory.CreateDirectory(dir);
var inv = CultureInfo.InvariantCulture;


// 1. Reference scoring throughput, 784×500, 13% active bits.
const int V = 784, H = 500, Rows = 20000;
var model = BenchModels.RandomRbm(V, H, 1, 0.05);
ModelJson.WriteFile(model, Path.Combine(dir, "model-784x500.json"), force: true);
var rng = new Random(2);
var units = new byte[Rows * V];
for (int k = 0; k < units.Length; k++) units[k] = (byte)(rng.NextDouble() < 0.13 ? 1 : 0);
using (var w = new StreamWriter(Path.Combine(dir, "vectors.csv")))
{
    var sb = new StringBuilder();
    for (int r = 0; r < Rows; r++)
    {
        sb.Clear();
        for (int i = 0; i < V; i++) { if (i > 0) sb.Append(','); sb.Append((char)('0' + units[r * V + i])); }
        w.WriteLine(sb);
    }
}
var scorer = new ReferenceScorer(model);
var result = new double[Rows];
scorer.FreeEnergies(units, Rows, result); // warm-up
double best = double.MaxValue;
for (int rep = 0; rep < 5; rep++)
{
    var sw = Stopwatch.StartNew();
    scorer.FreeEnergies(units, Rows, result);
    best = Math.Min(best, sw.Elapsed.TotalSeconds);
}
File.WriteAllLines(Path.Combine(dir, "reference-free-energy.txt"), result.Select(x => x.ToString("R", inv)));
File.WriteAllText(Path.Combine(dir, "reference-timing.txt"), (Rows / best).ToString("F0", inv) + "\n");
Console.WriteLine($"reference_scoring  model=784x500 active=13% vectors={Rows} threads={Environment.ProcessorCount} " +
                  $"best_seconds={best.ToString("F4", inv)} vectors_per_second={(Rows / best).ToString("F0", inv)}");

// 2. Exact log Z for a 784×20 model: 2^20 hidden states, each summing 784 softplus terms.
var small = BenchModels.RandomRbm(784, 20, 3, 0.05);
ExactLogPartition.Compute(BenchModels.RandomRbm(784, 12, 4, 0.05)); // warm-up
var z = ExactLogPartition.Compute(small);
Console.WriteLine($"exact_log_z  model=784x20 states={z.States} seconds={z.Seconds.ToString("F3", inv)} " +
                  $"states_per_second={(z.States / z.Seconds).ToString("F0", inv)} log_z={z.LogPartition.ToString("R", inv)}");
return 0;
