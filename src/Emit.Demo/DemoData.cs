using System.Collections.Immutable;
using System.Globalization;
using System.Text;
using System.Text.Json;
using Emit.Detection;
using Emit.Model;
using Emit.Reference;
using Emit.Training;

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

    /// <summary>
    /// The threshold is this quantile of the free energy of the calibration rows (rounded up, see
    /// <see cref="Calibrate"/>).
    /// </summary>
    public const double ThresholdQuantile = 0.995;

    /// <summary>File names written by <see cref="Write"/>.</summary>
    public const string ModelFileName = "reefer-fleet.json";
    public const string NormalFileName = "normal.csv";
    public const string FaultyFileName = "faulty.csv";
    public const string FaultsFileName = "faults.csv";

    /// <summary>
    /// The trainer settings used for the demo model: emit train's defaults with 16 hidden units and the seed from
    /// <see cref="Seed"/>, i.e. <c>emit train --data training.csv --hidden 16 --seed TrainerSeed</c>.
    /// </summary>
    public static TrainerSettings TrainerSettings => new() { Hidden = 16, Seed = TrainerSeed };

    /// <summary>The trainer's seed (the fifth output of the master generator).</summary>
    public static ulong TrainerSeed => Seeds().Trainer;

    /// <summary>
    /// File name the training rows have in the model's metadata (they are not shipped; <see cref="TrainingData()"/>
    /// makes them).
    /// </summary>
    public const string TrainingFileName = "training.csv";

    /// <summary>
    /// The training rows, as <c>emit train</c> reads them from <see cref="TrainingFileName"/> (header of flag names,
    /// then 0/1 rows).
    /// </summary>
    public static TrainingData TrainingData() =>
        TrainingData(Draw(new ReeferFleetGenerator(Seeds().Training), TrainingRows, faulty: false));

    /// <summary>
    /// The training rows <paramref name="rows"/> as <c>emit train</c> reads them from <see cref="TrainingFileName"/>.
    /// </summary>
    public static TrainingData TrainingData(ImmutableArray<ReeferRow> rows) =>
        Training.TrainingData.FromRows(rows.Select(r => r.Flags).ToList(), ReeferFlags.Names, TrainingFileName);

    /// <summary>
    /// Draws the four logs of the scenario (training, calibration, normal, faulty); same rows every run.
    /// </summary>
    public static DemoLogs Logs()
    {
        var seeds = Seeds();
        return new DemoLogs(
            Draw(new ReeferFleetGenerator(seeds.Training), TrainingRows, faulty: false),
            Draw(new ReeferFleetGenerator(seeds.Calibration), CalibrationRows, faulty: false),
            Draw(new ReeferFleetGenerator(seeds.Normal), NormalRows, faulty: false),
            Draw(new ReeferFleetGenerator(seeds.Faulty), FaultyRows, faulty: true));
    }

    /// <summary>
    /// A calibrated threshold rounded up to a multiple of 0.001, as the shipped model's is, so that a last-bit
    /// difference in a platform's exp/log cannot change the written value (except at an exact multiple).
    /// </summary>
    public static double RoundThreshold(double threshold) => Math.Ceiling(threshold * 1000) / 1000;

    /// <summary>Rows as a CSV file: a header of flag names, then one 0/1 row per report ("\n" line ends).</summary>
    public static string Csv(IReadOnlyList<ReeferRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var sb = new StringBuilder(rows.Count * ReeferFlags.Count * 2 + 1024);
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

    /// <summary>Draws the reports, trains and calibrates the model (a second or two, single-threaded).</summary>
    public static DemoDataSet Build()
    {
        var logs = Logs();
        var (calibration, normal, faulty) = (logs.Calibration, logs.Normal, logs.Faulty);

        var settings = TrainerSettings;
        var training = TrainingData(logs.Training);
        var trained = Trainer.Train(training, settings);
        double threshold = Calibrate(trained.Model, calibration);
        var m = trained.Model;
        var model = new BoltzmannModel(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, m.Weights,
            names: m.Names, threshold: threshold, metadataJson: Metadata(training, settings, trained));
        return new DemoDataSet(model, normal, faulty,
            trained.Epochs.Select(e => e.ReconstructionError).ToImmutableArray());
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

    /// <summary>
    /// Builds the demo data and writes its four files into <paramref name="folder"/> (created if missing); returns
    /// their paths.
    /// </summary>
    public static IReadOnlyList<string> WriteAll(string folder) => Write(Build(), folder);

    /// <summary>
    /// Writes the four files of <paramref name="data"/> into <paramref name="folder"/>, each atomically; returns their
    /// paths.
    /// </summary>
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
        return RoundThreshold(q);
    }

    private static ImmutableArray<ReeferRow> Draw(ReeferFleetGenerator g, int count, bool faulty)
    {
        var b = ImmutableArray.CreateBuilder<ReeferRow>(count);
        for (int k = 0; k < count; k++) b.Add(faulty ? g.NextFaulty() : g.NextNormal());
        return b.MoveToImmutable();
    }

    private static (ulong Training, ulong Calibration, ulong Normal, ulong Faulty, ulong Trainer) Seeds()
    {
        var s = new SplitMix64(Seed);
        return (s.Next(), s.Next(), s.Next(), s.Next(), s.Next());
    }

    private static string Metadata(TrainingData training, TrainerSettings t, TrainingResult trained)
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true, NewLine = "\n" }))
        {
            void Num(string name, double x) { w.WritePropertyName(name); w.WriteRawValue(ModelJson.Number(x)); }
            w.WriteStartObject();
            w.WriteString("name", "reefer-fleet");
            w.WriteString("description",
                "Invented demo scenario: 56 status flags of a refrigerated container fleet. Not real data.");
            w.WriteString("caution", "A monitoring aid, not a safety function.");
            w.WriteString("regenerate",
                "dotnet run demo-data/regenerate.cs (Emit.Demo.DemoData.WriteAll; the model is what emit train makes " +
                "of the training rows with the options in metadata.training); see demo-data/README.md");
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
            TrainingMetadata.WriteTraining(w, training, null, t, trained);
            w.WriteNumber("training_rows", TrainingRows);
            w.WriteStartObject("threshold");
            w.WriteString("method",
                "conformal threshold at false-alarm rate 1 - quantile over held-out normal rows (docs/calibrate.md), " +
                "rounded up to 0.001");
            Num("quantile", ThresholdQuantile);
            w.WriteNumber("calibration_rows", CalibrationRows);
            w.WriteEndObject();
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(stream.ToArray()).Replace("\n", "\n  ");
    }
}
