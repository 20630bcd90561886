using System.CommandLine;
using System.Globalization;
using System.Text.Json;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Cli.Commands;

/// <summary>
/// <c>emit inspect MODEL [--json]</c>: kind, sizes, parameter statistics, hidden input ranges, table sizes, SHA-256;
/// with <c>--numeric</c> the predicted footprint and what each firmware feature adds.
/// </summary>
public sealed class InspectCommand : ICliCommand
{
    private readonly Argument<FileInfo> _model =
        new Argument<FileInfo>("MODEL") { Description = "Model file (.json or .npz)" }.MustExist();
    private readonly Option<bool> _json =
        new("--json") { Description = "Write the report as JSON to standard output instead of text" };
    private readonly Option<Chosen<NumericMode>> _numeric = CliOptions.Choice(
        "--numeric",
        "Also plan this numeric mode (fixed adds Q formats, the proved error bound and table sizes); every mode adds " +
                     "the predicted flash, stack and run-time dependencies of the generated C and the extra flash " +
                     "and RAM of each firmware feature (alarm filter, stream, explain, classifier)",
        NumericChoices.All);

    private readonly Option<OptimizeFor> _optimize = new("--optimize")
    {
        HelpName = "speed|size",
        Description = "Layout the footprint is predicted for: speed or size (as for compile) [default: speed]",
    };
    private readonly FixedPointOptionSet _fixed = new();

    public Command Build(CliContext ctx)
    {
        var cmd = new Command("inspect",
            "Describe a model: kind, sizes, parameter statistics, each hidden unit's input range, table sizes and " +
            "SHA-256")
        {
            _model, _json, _numeric, _optimize,
        };
        _fixed.AddTo(cmd);
        cmd.SetAction(parse =>
        {
            var path = parse.GetRequiredValue(_model).FullName;
            var model = ModelLoader.Load(path);
            var stats = ModelStatistics.Of(model);
            var mode = parse.GetValue(_numeric)?.Value;
            FixedPointPlan? plan = null;
            ScorerFootprint? footprint = null;
            Features? features = null;
            try
            {
                var fixedOptions = mode == NumericMode.Fixed ? _fixed.Read(parse) : null;
                if (fixedOptions is not null) plan = FixedPointPlanner.Build(model, fixedOptions);
                if (mode is { } m)
                {
                    var options = new CompileOptions(["c"], m, "model", Fixed: fixedOptions,
                        Optimize: parse.GetValue(_optimize));
                    ScorerPlan Plan(CompileOptions o) =>
                        plan is null ? FloatScorerPlan.Build(model, o, Path.GetFileName(path))
                            : FixedScorerPlan.Build(model, o, Path.GetFileName(path), plan);
                    var scorer = Plan(options);
                    footprint = FootprintModel.Predict(scorer);
                    // the figures of the stream and explanation code, from a plan that emits them
                    var explained = model.Kind == ModelKind.General ? null : Plan(options with { Explain = true });
                    features = new Features(FootprintModel.FilterCost(m), explained,
                        FootprintModel.ClassifierPerModel(scorer));
                }
            }
            catch (EmitException e) when (e.File is null && e.Line is null)
            {
                throw e.InFile(path);
            }
            if (parse.GetValue(_json)) WriteJson(ctx.Out, path, model, stats, plan, footprint, features);
            else WriteText(ctx.Out, path, model, stats, plan, footprint, features);
            return CliApp.Ok;
        });
        return cmd;
    }

    private static string N(double x) => x.ToString("G6", CultureInfo.InvariantCulture);

    /// <summary>What the alarm filter costs, and a plan emitting stream and explanation code (null: kind general).
    /// The figures are read from <see cref="FeatureFootprint"/> and <see cref="FootprintModel"/>, as the header's.
    /// </summary>
    private sealed record Features(FeatureCost Filter, ScorerPlan? Explained, FeatureCost ClassifierPerModel)
    {
        public const string FilterAssumption = "any K/N with N <= 32: the window is one 32-bit word";
        public const string NoStream = "not for kind general (a flip changes every term of the hidden sum)";
        public long StreamFlash => Explained is { } p ? FeatureFootprint.StreamFlash(p) : 0;
        public long StreamRam => Explained is { } p ? FeatureFootprint.StreamRam(p) : 0;
        public long ExplainFlash => Explained is { } p ? FeatureFootprint.ExplainFlash(p) : 0;
        public int ExplainStack => Explained is { } p ? FeatureFootprint.ExplainStack(p, StreamRam) : 0;
    }

    private static void WriteText(TextWriter o, string path, BoltzmannModel m, ModelStatistics s, FixedPointPlan? plan,
        ScorerFootprint? footprint, Features? features)
    {
        o.WriteLine($"model          {path}");
        o.WriteLine($"sha256         {m.Sha256}");
        o.WriteLine($"kind           {m.Kind.ToText()}");
        o.WriteLine($"units          {m.Visible} visible, {m.Hidden} hidden" + (m.Names.IsEmpty ? "" : " (named)"));
        if (m.Kind != ModelKind.Rbm)
            o.WriteLine(
                $"links          {m.VisibleLinks.Length} visible-visible" +
                (m.Kind == ModelKind.General ? $", {m.HiddenLinks.Length} hidden-hidden" : ""));
        o.WriteLine($"threshold      {(m.Threshold is { } t ? N(t) : "none")}");
        o.WriteLine(
            "log partition  " +
            $"{(m.LogPartition is { } z ? $"{N(z.Value)} ({z.Method}, stderr {N(z.Stderr)})" : "none")}");
        o.WriteLine();
        o.WriteLine("parameters      count       min         max         mean        std         mean|x|");
        void Row(string name, ValueSummary v)
        {
            if (v.Count == 0) return;
            o.WriteLine(
                $"{name,-15} {v.Count,-11} {N(v.Min),-11} {N(v.Max),-11} {N(v.Mean),-11} {N(v.Std),-11} " +
                $"{N(v.MeanAbs)}");
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
        if (footprint is { } fp)
        {
            o.WriteLine();
            o.WriteLine($"footprint      {fp.Reference}, {CompileOptions.DefaultSelfTestVectors} self-test vectors");
            o.WriteLine(
                $"  flash        {fp.FlashBytes} bytes predicted (code {fp.Figures.CodeBytes}, tables " +
                $"{fp.Figures.TableBytes})");
            o.WriteLine(
                $"  stack        {fp.StackBytes} bytes worst case predicted ({fp.Figures.LibraryStackAllowance} of " +
                "them for library calls)");
            var libm = fp.LibmFunctions.Count == 0
                ? "no libm function"
                : string.Join(", ", fp.LibmFunctions) + " (libm: link with -lm)";
            o.WriteLine($"  run time     {libm}; a compiler may call memcpy and memset");
            if (features is { } x)
            {
                o.WriteLine("extra cost of each firmware feature (compile options), on the same core:");
                o.WriteLine($"  alarm filter flash +{x.Filter.FlashBytes} bytes, RAM {x.Filter.RamBytes} bytes per " +
                            $"filter ({Features.FilterAssumption})");
                if (x.Explained is null)
                {
                    o.WriteLine($"  stream       {Features.NoStream}");
                    o.WriteLine($"  explain      {Features.NoStream}");
                }
                else
                {
                    o.WriteLine($"  stream       flash +{x.StreamFlash} bytes, RAM {x.StreamRam} bytes per stream " +
                                "state (NAME_stream_t)");
                    o.WriteLine($"  explain      flash +{x.ExplainFlash} bytes beyond the stream code, stack " +
                                $"{x.ExplainStack} bytes worst case (implies the stream code)");
                }
                o.WriteLine($"  classifier   flash +{x.ClassifierPerModel.FlashBytes} bytes and RAM " +
                            $"{x.ClassifierPerModel.RamBytes} bytes per model scored, plus " +
                            $"{FootprintModel.ClassifierCodeBase} bytes of flash once, beside each model's own scorer");
            }
        }
        if (plan is null) return;
        o.WriteLine();
        o.WriteLine(
            $"fixed point    {plan.WeightType.ToText()} weights, {plan.Accumulator.ToText()} accumulator " +
            $"({plan.AccumulatorReason})");
        o.WriteLine($"  energy       {plan.EnergyFormat} (real = value / 2^{plan.EnergyFractionBits})");
        o.WriteLine($"  weights      {plan.WeightFormatSummary}");
        o.WriteLine($"  accumulators {plan.AccumulatorFormatSummary}");
        if (!plan.Lateral.IsEmpty) o.WriteLine($"  lateral      {plan.LateralFormat}");
        o.WriteLine(
            $"  softplus     {plan.Table.Segments} segments over [0, {N(plan.Table.Range)}], entries " +
            $"{plan.Table.EntryFormat}, {plan.TableBytes} bytes");
        o.WriteLine($"  rounding     half away from zero; no division, no left shift of negative values");
        o.WriteLine(
            $"  error bound  {plan.ErrorBound.ToString("R", CultureInfo.InvariantCulture)} nats, worst case over all " +
            "binary vectors");
        o.WriteLine($"  table bytes  weights {plan.WeightBytes}, softplus table {plan.TableBytes}");
    }

    private static void WriteJson(TextWriter o, string path, BoltzmannModel m, ModelStatistics s, FixedPointPlan? plan,
        ScorerFootprint? footprint, Features? features) => JsonOut.Write(o, w =>
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
        if (plan is not null)
        {
            w.WriteNumber("error_bound", plan.ErrorBound);
            w.WriteStartObject("fixed_point");
            w.WriteString("weights", plan.WeightType.ToText());
            w.WriteString("accumulator", plan.Accumulator.ToText());
            w.WriteString("accumulator_reason", plan.AccumulatorReason);
            w.WriteString("energy_format", plan.EnergyFormat.ToString());
            w.WriteNumber("energy_scale", plan.EnergyScale);
            w.WriteString("weight_formats", plan.WeightFormatSummary);
            w.WriteString("accumulator_formats", plan.AccumulatorFormatSummary);
            if (!plan.Lateral.IsEmpty) w.WriteString("lateral_format", plan.LateralFormat.ToString());
            w.WriteStartArray("hidden_units");
            foreach (var u in plan.Units)
            {
                w.WriteStartObject();
                w.WriteString("weight_format", u.WeightFormat.ToString());
                w.WriteString("accumulator_format", u.AccumulatorFormat.ToString());
                w.WriteNumber("error_max_abs", u.Error.MaxAbs);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteStartObject("softplus_table");
            w.WriteNumber("segments", plan.Table.Segments);
            w.WriteNumber("range", plan.Table.Range);
            w.WriteString("entry_format", plan.Table.EntryFormat.ToString());
            w.WriteNumber("bytes", plan.TableBytes);
            w.WriteEndObject();
            w.WriteString("rounding", "half away from zero");
            w.WriteNumber("error_bound", plan.ErrorBound);
            w.WriteStartObject("error_parts");
            void Part(string name, ErrorInterval e)
            {
                w.WriteStartArray(name);
                w.WriteNumberValue(e.Lo);
                w.WriteNumberValue(e.Hi);
                w.WriteEndArray();
            }
            Part("visible_bias", plan.Error.VisibleBias);
            Part("lateral", plan.Error.Lateral);
            Part("hidden_inputs", plan.Error.HiddenInputs);
            Part("softplus", plan.Error.Softplus);
            Part("log_sum_exp", plan.Error.LogSumExp);
            Part("total", plan.Error.Total);
            w.WriteNumber("slack", plan.Error.Slack);
            w.WriteEndObject();
            w.WriteNumber("weight_bytes", plan.WeightBytes);
            w.WriteEndObject();
        }
        if (footprint is { } fp)
        {
            w.WriteStartObject("footprint");
            w.WriteString("reference", fp.Reference);
            w.WriteNumber("self_test_vectors", CompileOptions.DefaultSelfTestVectors);
            w.WriteNumber("flash_bytes", fp.FlashBytes);
            w.WriteNumber("code_bytes", fp.Figures.CodeBytes);
            w.WriteNumber("table_bytes", fp.Figures.TableBytes);
            w.WriteNumber("stack_bytes", fp.StackBytes);
            w.WriteNumber("library_stack_allowance", fp.Figures.LibraryStackAllowance);
            w.WriteStartArray("libm_functions");
            foreach (var f in fp.LibmFunctions) w.WriteStringValue(f);
            w.WriteEndArray();
            w.WriteStartArray("memory_functions");
            foreach (var f in ScorerFootprint.MemoryFunctions) w.WriteStringValue(f);
            w.WriteEndArray();
            if (features is { } x)
            {
                w.WriteStartObject("features");
                w.WriteStartObject("alarm_filter");
                w.WriteNumber("flash_bytes", x.Filter.FlashBytes);
                w.WriteNumber("ram_bytes", x.Filter.RamBytes);
                w.WriteString("assumption", Features.FilterAssumption);
                w.WriteEndObject();
                if (x.Explained is null)
                {
                    w.WriteNull("stream");
                    w.WriteNull("explain");
                }
                else
                {
                    w.WriteStartObject("stream");
                    w.WriteNumber("flash_bytes", x.StreamFlash);
                    w.WriteNumber("ram_bytes", x.StreamRam);
                    w.WriteEndObject();
                    w.WriteStartObject("explain");
                    w.WriteNumber("flash_bytes", x.ExplainFlash);
                    w.WriteNumber("stack_bytes", x.ExplainStack);
                    w.WriteEndObject();
                }
                w.WriteStartObject("classifier");
                w.WriteNumber("flash_bytes_per_model", x.ClassifierPerModel.FlashBytes);
                w.WriteNumber("ram_bytes_per_model", x.ClassifierPerModel.RamBytes);
                w.WriteNumber("flash_bytes_once", FootprintModel.ClassifierCodeBase);
                w.WriteEndObject();
                w.WriteEndObject();
            }
            w.WriteEndObject();
        }
        w.WriteEndObject();
    });
}
