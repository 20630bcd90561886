using System.Text;
using System.Text.Json;
using Emit.Model;

namespace Emit.Training;

/// <summary>
/// The <c>metadata</c> a trained model carries: the tool version, the training (and validation) data's file name,
/// SHA-256 and row count, every setting, the epochs run, the epoch kept, its figures, and the constant units.
/// </summary>
public static class TrainingMetadata
{
    /// <summary>The emit version that trained the model (the library assembly's version, major.minor.build).</summary>
    public static string ToolVersion
    {
        get
        {
            var v = typeof(Trainer).Assembly.GetName().Version ?? new Version(0, 0, 0);
            return $"{v.Major}.{v.Minor}.{Math.Max(0, v.Build)}";
        }
    }

    /// <summary>
    /// A complete <c>metadata</c> object (text, indented to sit inside a model file) with one <c>training</c> member.
    /// </summary>
    public static string Json(TrainingData data, TrainingData? validation, TrainerSettings settings,
        TrainingResult result)
    {
        using var stream = new MemoryStream();
        using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true, NewLine = "\n" }))
        {
            w.WriteStartObject();
            w.WriteString("tool", "emit " + ToolVersion);
            WriteTraining(w, data, validation, settings, result);
            w.WriteEndObject();
        }
        return Indent(stream);
    }

    /// <summary>Writes the <c>training</c> member into an open object (the demo adds it to its own metadata).</summary>
    public static void WriteTraining(Utf8JsonWriter w, TrainingData data, TrainingData? validation, TrainerSettings s,
        TrainingResult result)
    {
        ArgumentNullException.ThrowIfNull(w);
        ArgumentNullException.ThrowIfNull(data);
        ArgumentNullException.ThrowIfNull(s);
        ArgumentNullException.ThrowIfNull(result);
        void Num(string name, double x) { w.WritePropertyName(name); w.WriteRawValue(ModelJson.Number(x)); }
        void Data(string name, TrainingData d)
        {
            w.WriteStartObject(name);
            w.WriteString("file", Path.GetFileName(d.Source));
            w.WriteString("sha256", d.Sha256);
            w.WriteNumber("rows", d.Rows);
            w.WriteEndObject();
        }
        w.WriteStartObject("training");
        w.WriteString("trainer", "emit train " + ToolVersion);
        Data("data", data);
        if (validation is not null) Data("validation", validation);
        w.WriteStartObject("options");
        w.WriteString("kind", s.Kind.ToText());
        w.WriteNumber("hidden", s.Hidden);
        w.WriteString("method", s.Method == TrainingMethod.Pcd ? "pcd" : "cd");
        w.WriteNumber("gibbs_steps", s.GibbsSteps);
        w.WriteNumber("epochs", s.Epochs);
        w.WriteNumber("batch", s.BatchSize);
        Num("learning_rate", s.LearningRate);
        w.WriteBoolean("learning_rate_decay", s.DecayLearningRate);
        Num("initial_momentum", s.InitialMomentum);
        Num("momentum", s.Momentum);
        w.WriteNumber("momentum_switch_epoch", s.MomentumSwitchEpoch);
        Num("weight_decay", s.WeightDecay);
        Num("initial_weight_scale", s.InitialWeightScale);
        w.WriteNumber("patience", s.Patience);
        w.WriteNumber("seed", s.Seed);
        w.WriteEndObject();
        w.WriteNumber("epochs_run", result.Epochs.Length);
        w.WriteNumber("epoch_kept", result.EpochKept);
        w.WriteBoolean("stopped_early", result.StoppedEarly);
        if (result.Kept is { } k)
        {
            Num("reconstruction_error", k.ReconstructionError);
            if (k.FreeEnergyGap is { } gap) Num("validation_free_energy_gap", gap);
            if (k.ValidationLogLikelihood is { } ll) Num("validation_log_likelihood", ll);
            if (k.ValidationPseudoLogLikelihood is { } pll) Num("validation_pseudo_log_likelihood", pll);
        }
        w.WriteStartArray("constant_units");
        foreach (var i in result.ConstantUnits)
        {
            if (data.Names.IsEmpty) w.WriteNumberValue(i);
            else w.WriteStringValue(data.Names[i]);
        }
        w.WriteEndArray();
        w.WriteEndObject();
    }

    /// <summary>
    /// The written JSON with each line after the first indented by two spaces, as metadata sits in a model file.
    /// </summary>
    public static string Indent(MemoryStream stream) =>
        Encoding.UTF8.GetString(stream.ToArray()).Replace("\n", "\n  ");
}
