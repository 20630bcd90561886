using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using Emit.Model;

namespace Emit.Cli.Commands;

/// <summary><c>emit inspect MODEL [--json]</c>: kind, sizes, parameter statistics, hidden input ranges, table sizes, SHA-256.</summary>
public sealed class InspectCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model = new("MODEL") { Description = "Model file (.json or .npz)" };
    private readonly Option<bool> _json = new("--json") { Description = "Write the report as JSON" };

    public Command Build(CliContext ctx)
    {
        _model.AcceptExistingOnly();
        var cmd = new Command("inspect", "Describe a model: kind, sizes, parameter statistics, each hidden unit's input range, table sizes and SHA-256")
        {
            _model, _json,
        };
        cmd.SetAction(parse =>
        {
            var path = parse.GetRequiredValue(_model).FullName;
            var model = ModelLoader.Load(path);
            var stats = ModelStatistics.Of(model);
            if (parse.GetValue(_json)) WriteJson(ctx.Out, path, model, stats);
            else WriteText(ctx.Out, path, model, stats);
            return CliApp.Ok;
        });
        return cmd;
    }

    private static string N(double x) => x.ToString("G6", CultureInfo.InvariantCulture);

    private static void WriteText(TextWriter o, string path, BoltzmannModel m, ModelStatistics s)
    {
        o.WriteLine($"model          {path}");
        o.WriteLine($"sha256         {m.Sha256}");
        o.WriteLine($"kind           {m.Kind.ToText()}");
        o.WriteLine($"units          {m.Visible} visible, {m.Hidden} hidden" + (m.Names.IsEmpty ? "" : " (named)"));
        if (m.Kind != ModelKind.Rbm) o.WriteLine($"links          {m.VisibleLinks.Length} visible-visible" + (m.Kind == ModelKind.General ? $", {m.HiddenLinks.Length} hidden-hidden" : ""));
        o.WriteLine($"threshold      {(m.Threshold is { } t ? N(t) : "none")}");
        o.WriteLine($"log partition  {(m.LogPartition is { } z ? $"{N(z.Value)} ({z.Method}, stderr {N(z.Stderr)})" : "none")}");
        o.WriteLine();
        o.WriteLine("parameters      count       min         max         mean        std         mean|x|");
        void Row(string name, ValueSummary v)
        {
            if (v.Count == 0) return;
            o.WriteLine($"{name,-15} {v.Count,-11} {N(v.Min),-11} {N(v.Max),-11} {N(v.Mean),-11} {N(v.Std),-11} {N(v.MeanAbs)}");
        }
        Row("weights", s.Weights);
        Row("visible_bias", s.VisibleBias);
        Row("hidden_bias", s.HiddenBias);
        Row("visible_links", s.VisibleLinks);
        Row("hidden_links", s.HiddenLinks);
        o.WriteLine();
        o.WriteLine("hidden unit input range over all binary vectors (c_j + Σ min(0,W_ij) .. c_j + Σ max(0,W_ij))");
        for (int j = 0; j < s.HiddenInputRanges.Count; j++)
            o.WriteLine($"  h{j,-5} {N(s.HiddenInputRanges[j].Min),12} .. {N(s.HiddenInputRanges[j].Max)}");
        o.WriteLine();
        o.WriteLine("table bytes    " + string.Join("  ", s.TableBytes.Select(kv => $"{kv.Key} {kv.Value}")));
    }

    private static void WriteJson(TextWriter o, string path, BoltzmannModel m, ModelStatistics s) => JsonOut.Write(o, w =>
    {
        w.WriteStartObject();
        w.WriteString("model", path);
        w.WriteString("sha256", m.Sha256);
        w.WriteString("kind", m.Kind.ToText());
        w.WriteNumber("visible", m.Visible);
        w.WriteNumber("hidden", m.Hidden);
        w.WriteNumber("visible_links", m.VisibleLinks.Length);
        w.WriteNumber("hidden_links", m.HiddenLinks.Length);
        w.WriteBoolean("named_units", !m.Names.IsEmpty);
        if (m.Threshold is { } t) w.WriteNumber("threshold", t); else w.WriteNull("threshold");
        if (m.LogPartition is { } z)
        {
            w.WriteStartObject("log_partition");
            w.WriteNumber("value", z.Value);
            w.WriteString("method", z.Method);
            w.WriteNumber("stderr", z.Stderr);
            w.WriteEndObject();
        }
        else w.WriteNull("log_partition");
        w.WriteStartObject("parameters");
        void Summary(string name, ValueSummary v)
        {
            w.WriteStartObject(name);
            w.WriteNumber("count", v.Count);
            w.WriteNumber("min", v.Min);
            w.WriteNumber("max", v.Max);
            w.WriteNumber("mean", v.Mean);
            w.WriteNumber("std", v.Std);
            w.WriteNumber("mean_abs", v.MeanAbs);
            w.WriteEndObject();
        }
        Summary("weights", s.Weights);
        Summary("visible_bias", s.VisibleBias);
        Summary("hidden_bias", s.HiddenBias);
        Summary("visible_links", s.VisibleLinks);
        Summary("hidden_links", s.HiddenLinks);
        w.WriteEndObject();
        w.WriteStartArray("hidden_input_ranges");
        foreach (var r in s.HiddenInputRanges)
        {
            w.WriteStartObject();
            w.WriteNumber("min", r.Min);
            w.WriteNumber("max", r.Max);
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteStartObject("table_bytes");
        foreach (var kv in s.TableBytes) w.WriteNumber(kv.Key, kv.Value);
        w.WriteEndObject();
        w.WriteEndObject();
    });
}
