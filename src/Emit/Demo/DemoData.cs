using System.Collections.Immutable;
using System.Globalization;
using System.Text;
using System.Text.Json;
using Emit.Detection;
using Emit.Model;
using Emit.Reference;

namespace Emit.Demo;

/// <summary>
/// Makes the shipped demo data (demo-data/ in the repository) from scratch: draws training, calibration, normal
/// and faulty reports of the invented reefer fleet, trains the RBM, calibrates its threshold, and writes
/// <c>reefer-fleet.json</c>, <c>normal.csv</c>, <c>faulty.csv</c> and <c>faults.csv</c>. Same bytes every run.
/// </summary>
public static class DemoData
{
    /// <summary>Master seed; each data set and the trainer get their own stream seeded from it.</summary>
    public const ulong Seed = 20261130;

    /// <summary>Normal reports the RBM is trained on (not shipped).</summary>
    public const int TrainingRows = 5000;

    /// <summary>Held-out normal reports the threshold is calibrated on (not shipped).</summary>
    public const int CalibrationRows = 20000;

    /// <summary>Rows of normal.csv: a fresh sample, used neither for training nor calibration.</summary>
    public const int NormalRows = 2000;

    /// <summary>Rows of faulty.csv.</summary>
    public const int FaultyRows = 400;

    /// <summary>The threshold is this quantile of the free energy of the calibration rows (rounded up, see <see cref="Calibrate"/>).</summary>
    public const double ThresholdQuantile = 0.995;

    /// <summary>File names written by <see cref="Write"/>.</summary>
    public const string ModelFileName = "reefer-fleet.json";
    public const string NormalFileName = "normal.csv";
    public const string FaultyFileName = "faulty.csv";
    public const string FaultsFileName = "faults.csv";

    /// <summary>The trainer settings used for the demo model (its seed comes from <see cref="Seed"/>).</summary>
    public static RbmTrainerSettings TrainerSettings => new() { Seed = Seeds().Trainer };

    /// <summary>Draws the reports, trains and calibrates the model (a second or two, single-threaded).</summary>
    public static DemoDataSet Build()
    {
        var seeds = Seeds();
        var training = Draw(new ReeferFleetGenerator(seeds.Training), TrainingRows, faulty: false);
        var calibration = Draw(new ReeferFleetGenerator(seeds.Calibration), CalibrationRows, faulty: false);
        var normal = Draw(new ReeferFleetGenerator(seeds.Normal), NormalRows, faulty: false);
        var faulty = Draw(new ReeferFleetGenerator(seeds.Faulty), FaultyRows, faulty: true);

        var settings = TrainerSettings;
        var trained = RbmTrainer.Train(training.Select(r => r.Flags).ToList(), ReeferFlags.Names, settings);
        double threshold = Calibrate(trained.Model, calibration);
        var m = trained.Model;
        var model = new BoltzmannModel(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, m.Weights,
            names: m.Names, threshold: threshold, metadataJson: Metadata(settings, trained.ReconstructionError));
        return new DemoDataSet(model, normal, faulty, trained.ReconstructionError);
    }

    /// <summary>The text of each file (name → content, "\n" line ends).</summary>
    public static ImmutableSortedDictionary<string, string> Render(DemoDataSet data)
    {
        ArgumentNullException.ThrowIfNull(data);
        var faults = new StringBuilder("index,fault,mode\n");
        for (int k = 0; k < data.Faulty.Length; k++)
            faults.Append(k.ToString(CultureInfo.InvariantCulture)).Append(',').Append(data.Faulty[k].Fault)
                  .Append(',').Append(data.Faulty[k].Mode).Append('\n');
        return ImmutableSortedDictionary.CreateRange(StringComparer.Ordinal, new[]
        {
            KeyValuePair.Create(ModelFileName, ModelJson.ToText(data.Model)),
            KeyValuePair.Create(NormalFileName, Csv(data.Normal)),
            KeyValuePair.Create(FaultyFileName, Csv(data.Faulty)),
            KeyValuePair.Create(FaultsFileName, faults.ToString()),
        });
    }

    /// <summary>Builds the demo data and writes its four files into <paramref name="folder"/> (created if missing); returns their paths.</summary>
    public static IReadOnlyList<string> WriteAll(string folder) => Write(Build(), folder);

    /// <summary>Writes the four files of <paramref name="data"/> into <paramref name="folder"/>, each atomically; returns their paths.</summary>
    public static IReadOnlyList<string> Write(DemoDataSet data, string folder)
    {
        ArgumentException.ThrowIfNullOrEmpty(folder);
        var written = new List<string>();
        foreach (var (name, text) in Render(data))
        {
            var path = Path.Combine(folder, name);
            AtomicFile.WriteAllText(path, text, force: true);
            written.Add(path);
        }
        return written;
    }

    /// <summary>
    /// The threshold: the conformal threshold at false-alarm rate 1 − q (<see cref="ConformalThreshold"/>: the
    /// ⌈(n + 1)·q⌉-th smallest calibration free energy), rounded up to a multiple of 0.001 so that a last-bit
    /// difference in a platform's exp/log cannot change the written value (except at an exact multiple).
    /// </summary>
    internal static double Calibrate(BoltzmannModel model, IReadOnlyList<ReeferRow> calibration)
    {
        var scorer = new ReferenceScorer(model);
        var energies = calibration.Select(r => scorer.FreeEnergy(r.Flags.AsSpan())).ToArray();
        double q = ConformalThreshold.Threshold(energies, 1 - ThresholdQuantile);
        return Math.Ceiling(q * 1000) / 1000;
    }

    private static ImmutableArray<ReeferRow> Draw(ReeferFleetGenerator g, int count, bool faulty)
    {
        var b = ImmutableArray.CreateBuilder<ReeferRow>(count);
        for (int k = 0; k < count; k++) b.Add(faulty ? g.NextFaulty() : g.NextNormal());
        return b.MoveToImmutable();
    }

    private static string Csv(ImmutableArray<ReeferRow> rows)
    {
        var sb = new StringBuilder(rows.Length * ReeferFlags.Count * 2 + 1024);
        sb.AppendJoin(',', ReeferFlags.Names).Append('\n');
        foreach (var r in rows)
        {
            for (int i = 0; i < r.Flags.Length; i++)
            {
                if (i > 0) sb.Append(',');
                sb.Append(r.Flags[i] != 0 ? '1' : '0');
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private static (ulong Training, ulong Calibration, ulong Normal, ulong Faulty, ulong Trainer) Seeds()
    {
        var s = new SplitMix64(Seed);
        return (s.Next(), s.Next(), s.Next(), s.Next(), s.Next());
    }

    private static string Metadata(RbmTrainerSettings t, ImmutableArray<double> error)
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true, NewLine = "\n" }))
        {
            void Num(string name, double x) { w.WritePropertyName(name); w.WriteRawValue(ModelJson.Number(x)); }
            w.WriteStartObject();
            w.WriteString("name", "reefer-fleet");
            w.WriteString("description", "Invented demo scenario: 56 status flags of a refrigerated container fleet. Not real data.");
            w.WriteString("caution", "A monitoring aid, not a safety function.");
            w.WriteString("regenerate", "dotnet run demo-data/regenerate.cs (Emit.Demo.DemoData.WriteAll); see demo-data/README.md");
            w.WriteStartObject("generator");
            w.WriteString("name", "Emit.Demo.ReeferFleetGenerator");
            w.WriteNumber("version", ReeferFleetGenerator.Version);
            w.WriteNumber("seed", Seed);
            w.WriteStartArray("modes");
            foreach (var m in ReeferModes.All) w.WriteStringValue(m.Name);
            w.WriteEndArray();
            w.WriteStartArray("faults");
            foreach (var f in ReeferFaults.All) w.WriteStringValue(f.Name);
            w.WriteEndArray();
            w.WriteEndObject();
            w.WriteStartObject("trainer");
            w.WriteString("name", "Emit.Demo.RbmTrainer");
            w.WriteString("method", "contrastive divergence");
            w.WriteNumber("cd_steps", t.CdSteps);
            w.WriteNumber("epochs", t.Epochs);
            w.WriteNumber("batch_size", t.BatchSize);
            Num("learning_rate", t.LearningRate);
            Num("initial_momentum", t.InitialMomentum);
            Num("final_momentum", t.FinalMomentum);
            w.WriteNumber("momentum_switch_epoch", t.MomentumSwitchEpoch);
            Num("weight_decay", t.WeightDecay);
            Num("initial_weight_scale", t.InitialWeightScale);
            w.WriteNumber("seed", t.Seed);
            Num("final_reconstruction_error", error.IsEmpty ? 0 : error[^1]);
            w.WriteEndObject();
            w.WriteNumber("training_rows", TrainingRows);
            w.WriteStartObject("threshold");
            w.WriteString("method", "conformal threshold at false-alarm rate 1 - quantile over held-out normal rows (docs/calibrate.md), rounded up to 0.001");
            Num("quantile", ThresholdQuantile);
            w.WriteNumber("calibration_rows", CalibrationRows);
            w.WriteEndObject();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(stream.ToArray()).Replace("\n", "\n  ");
    }
}
