using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using Emit.Emission;
using Emit.Analysis;
using Emit.Model;
using Emit.Reference;
using Emit.Vectors;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit diff OLD NEW --input DATA</c>: how a retrained or recalibrated model behaves differently from the one it
/// replaces on the same vectors: change of free energy, agreement of the ranking, decisions that change.
/// </summary>
public sealed class DiffCommand : ICliCommand
{
    public const string Caution =
        "a monitoring aid, not a safety function: this compares two models' judgements on the given vectors; defer " +
        "to local codes and licensed practice.";

    private readonly Argument<FileInfo> _old =
        new Argument<FileInfo>("OLD") { Description = "The model in use (.json or .npz)" }.MustExist();
    private readonly Argument<FileInfo> _new =
        new Argument<FileInfo>("NEW") { Description = "The model to replace it (.json or .npz)" }.MustExist();
    private readonly Option<string> _input = new("--input", "-i")
    {
        Description = "Vector file (CSV of 0/1, one vector per line), or - for standard input",
        Required = true,
        HelpName = "DATA",
    };
    private readonly Option<bool> _force = CliOptions.Force();
    private readonly Option<bool> _json =
        new("--json") { Description = "Write the comparison as JSON to standard output instead of text" };
    private readonly Option<string?> _report = new("--report")
    {
        Description = "Also write the comparison as JSON to this file",
        HelpName = "FILE",
    };
    private readonly Option<bool> _failOnChange = new("--fail-on-decision-change")
    {
        Description = "Exit 1 when any vector's unusual/usual decision changes (both models need a threshold)",
    };

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("diff",
            "Compare two versions of a model on the same vectors: free-energy change, ranking agreement, changed " +
            "decisions")
        {
            _old, _new, _input, _json, _report, _failOnChange, _force,
        };
        cmd.SetAction(parse =>
        {
            var oldPath = parse.GetRequiredValue(_old).FullName;
            var newPath = parse.GetRequiredValue(_new).FullName;
            var reportPath = parse.GetValue(_report);
            AtomicFile.RefuseInput(reportPath, oldPath, newPath, parse.GetRequiredValue(_input));
            var oldModel = ModelLoader.Load(oldPath);
            var newModel = ModelLoader.Load(newPath);
            string oldName = Path.GetFileName(oldPath), newName = Path.GetFileName(newPath);
            if (oldModel.Names.IsEmpty != newModel.Names.IsEmpty)
                ctx.Error.WriteLine(
                    $"emit: warning: {(oldModel.Names.IsEmpty ? newName : oldName)} has unit names and " +
                                    $"{(oldModel.Names.IsEmpty ? oldName : newName)} has none, so renamed or " +
                                    "reordered units cannot be seen");
            var firmware = ScorerInterface.Changes(ScorerInterface.Of(oldModel, oldPath),
                ScorerInterface.Of(newModel, newPath))
                .Select(c => Settings.Render(c, SettingFlags.Render)).ToList();
            if (oldModel.Visible != newModel.Visible)
                foreach (var change in firmware)
                    ctx.Error.WriteLine("emit: warning: breaks firmware built against the old scorer: " + change);
            bool failOnChange = parse.GetValue(_failOnChange);
            if (failOnChange && (oldModel.Threshold is null || newModel.Threshold is null))
                throw new EmitException("--fail-on-decision-change needs a threshold in both models",
                    "calibrate and store thresholds first",
                    oldModel.Threshold is null ? oldPath : newPath);
            using var reader = VectorReader.Open(parse.GetRequiredValue(_input), oldModel.Visible, ctx.In);
            VectorNames.Check(oldModel, reader);
            var report = ModelDiff.Compare(oldModel, newModel, reader);
            if (parse.GetValue(_json)) ctx.Out.Write(JsonText(report, oldName, newName, firmware));
            else WriteText(ctx.Out, report, oldName, newName, firmware);
            if (reportPath is not null)
            {
                AtomicFile.WriteAllText(Path.GetFullPath(reportPath), JsonText(report, oldName, newName, firmware),
                    parse.GetValue(_force));
                if (!parse.GetValue(_json)) ctx.Out.WriteLine($"wrote {Path.GetFullPath(reportPath)}");
            }
            return failOnChange && report.Decisions!.Changed > 0 ? CliApp.CheckFailed : CliApp.Ok;
        });
        return cmd;
    }

    private static string N(double x) => x.ToString("0.######", CultureInfo.InvariantCulture);

    private static string Signed(double x) => (x >= 0 ? "+" : "") + N(x);

    private static void WriteText(TextWriter o, ModelDiffReport r, string oldName, string newName,
        IReadOnlyList<string> firmware)
    {
        o.WriteLine($"{newName} against {oldName} on {r.Vectors} vectors (double-precision reference scorer)");
        foreach (var (label, name, s) in new[] { ("old", oldName, r.Old), ("new", newName, r.New) })
            o.WriteLine(
                $"  {label}  {name}: {s.Kind.ToText()}, {s.Visible} visible, {s.Hidden} hidden, threshold " +
                $"{(s.Threshold is { } t ? N(t) : "none")}, " +
                        $"log Z {(s.LogPartition is { } z ? N(z) : "none")}, sha256 {s.Sha256[..16]}…");
        o.WriteLine(
            $"free energy change F_new - F_old: mean {Signed(r.MeanDelta)}, rms {N(r.RmsDelta)}, largest |change| " +
            $"{N(r.MaxAbsDelta)} (vector {r.MaxAbsDeltaIndex})");
        o.WriteLine(r.Correlation is { } c
            ? $"correlation of F_old and F_new over the vectors: {c.ToString("0.0000", CultureInfo.InvariantCulture)}"
            : "correlation of F_old and F_new: undefined (one model gives every vector the same free energy)");
        if (r.MeanLogProbabilityDelta is { } lp)
            o.WriteLine(
                $"log-probability change: mean {Signed(lp)} nats (log Z " +
                $"{Signed(r.New.LogPartition!.Value - r.Old.LogPartition!.Value)})");
        if (r.Decisions is { } d)
        {
            o.WriteLine("decisions (unusual when F > the model's threshold):");
            o.WriteLine($"  usual in both        {d.BothUsual,10}");
            o.WriteLine($"  unusual in both      {d.BothUnusual,10}");
            o.WriteLine($"  newly unusual        {d.NewlyUnusual,10}");
            o.WriteLine($"  no longer unusual    {d.NoLongerUnusual,10}");
            if (d.FirstChanged.Count > 0)
                o.WriteLine(
                    "  changed first at vectors " +
                    $"{string.Join(", ", d.FirstChanged)}{(d.Changed > d.FirstChanged.Count ? ", …" : "")}");
        }
        else
        {
            o.WriteLine(
                "decisions: not compared (a threshold is missing from " +
                (r.Old.Threshold is null ? oldName : newName) + ")");
        }
        foreach (var u in r.RenamedUnits)
            o.WriteLine(
                $"note: unit {u.Unit} is \"{u.OldName}\" in {oldName} and \"{u.NewName}\" in {newName}; vectors are " +
                "matched by column");
        if (firmware.Count == 0)
            o.WriteLine(
                "firmware: nothing breaks code built against the old scorer (name, unit count, unit names, " +
                "fixed-point energy format)");
        foreach (var change in firmware)
            o.WriteLine("firmware: breaks code built against the old scorer: " + change);
        o.WriteLine("Caution: " + Caution);
    }

    private static string JsonText(ModelDiffReport r, string oldName, string newName, IReadOnlyList<string> firmware)
    {
        var text = new StringWriter { NewLine = "\n" };
        JsonOut.Write(text, w =>
        {
            w.WriteStartObject();
            w.WriteString("caution", Caution);
            w.WriteNumber("vectors", r.Vectors);
            foreach (var (label, name, s) in new[] { ("old", oldName, r.Old), ("new", newName, r.New) })
            {
                w.WriteStartObject(label);
                w.WriteString("file", name);
                w.WriteString("sha256", s.Sha256);
                w.WriteString("kind", s.Kind.ToText());
                w.WriteNumber("visible", s.Visible);
                w.WriteNumber("hidden", s.Hidden);
                if (s.Threshold is { } t) w.WriteNumber("threshold", t); else w.WriteNull("threshold");
                if (s.LogPartition is { } z) w.WriteNumber("log_partition", z); else w.WriteNull("log_partition");
                w.WriteEndObject();
            }
            w.WriteStartObject("free_energy_change");
            w.WriteNumber("mean", r.MeanDelta);
            w.WriteNumber("rms", r.RmsDelta);
            w.WriteNumber("max_abs", r.MaxAbsDelta);
            w.WriteNumber("max_abs_vector", r.MaxAbsDeltaIndex);
            w.WriteEndObject();
            if (r.Correlation is { } c) w.WriteNumber("correlation", c); else w.WriteNull("correlation");
            if (r.MeanLogProbabilityDelta is { } lp)
                w.WriteNumber("mean_log_probability_change", lp); else w.WriteNull("mean_log_probability_change");
            if (r.Decisions is { } d)
            {
                w.WriteStartObject("decisions");
                w.WriteNumber("usual_in_both", d.BothUsual);
                w.WriteNumber("unusual_in_both", d.BothUnusual);
                w.WriteNumber("newly_unusual", d.NewlyUnusual);
                w.WriteNumber("no_longer_unusual", d.NoLongerUnusual);
                w.WriteStartArray("first_changed");
                foreach (var k in d.FirstChanged) w.WriteNumberValue(k);
                w.WriteEndArray();
                w.WriteEndObject();
            }
            else
            {
                w.WriteNull("decisions");
            }
            w.WriteStartArray("renamed_units");
            foreach (var u in r.RenamedUnits)
            {
                w.WriteStartObject();
                w.WriteNumber("unit", u.Unit);
                w.WriteString("old", u.OldName);
                w.WriteString("new", u.NewName);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartArray("firmware_changes");
            foreach (var change in firmware) w.WriteStringValue(change);
            w.WriteEndArray();
            w.WriteEndObject();
        });
        return text.ToString();
    }
}
