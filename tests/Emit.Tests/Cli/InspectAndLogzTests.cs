using System.Text.Json;
using Emit.Model;

namespace Emit.Tests.Cli;

public sealed class InspectAndLogzTests
{
    private static string WriteModel(BoltzmannModel m)
    {
        var path = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(m, path, force: true);
        return path;
    }

    [Fact]
    public void Inspect_json_reports_identity_sizes_and_exact_hidden_ranges()
    {
        var m = TestModels.Random(ModelKind.Lateral, 7, 3, 4);
        var r = CliRunner.Run("inspect", WriteModel(m), "--json");
        Assert.Equal(0, r.ExitCode);
        var doc = JsonDocument.Parse(r.Out).RootElement;
        Assert.Equal(m.Sha256, doc.GetProperty("sha256").GetString());
        Assert.Equal(7, doc.GetProperty("visible").GetInt32());
        Assert.Equal("lateral", doc.GetProperty("kind").GetString());
        // The stated range is the true min/max of c_j + Σ v_i W_ij over all 2^7 vectors (brute force).
        var ranges = doc.GetProperty("hidden_input_ranges");
        for (int j = 0; j < 3; j++)
        {
            double lo = double.MaxValue, hi = double.MinValue;
            for (int bits = 0; bits < 128; bits++)
            {
                double x = m.HiddenBias[j];
                for (int i = 0; i < 7; i++) if (((bits >> i) & 1) != 0) x += m.Weight(i, j);
                lo = Math.Min(lo, x); hi = Math.Max(hi, x);
            }
            Assert.Equal(lo, ranges[j].GetProperty("min").GetDouble(), 12);
            Assert.Equal(hi, ranges[j].GetProperty("max").GetDouble(), 12);
        }
        Assert.Equal((7 * 3 + 7 + 3) * 4 + m.VisibleLinks.Length * 8, doc.GetProperty("table_bytes").GetProperty("f32").GetInt64());
    }

    [Fact]
    public void Logz_json_and_store_round_trip()
    {
        var m = TestModels.Random(ModelKind.Rbm, 9, 4, 2);
        var path = WriteModel(m);
        var r = CliRunner.Run("logz", path, "--method", "exact", "--json", "--store");
        Assert.Equal(0, r.ExitCode);
        var doc = JsonDocument.Parse(r.Out).RootElement;
        double logZ = doc.GetProperty("log_partition").GetDouble();
        Assert.Equal(Emit.Tests.Reference.BruteForce.LogPartition(m), logZ, 10);
        Assert.Equal("exact", doc.GetProperty("method").GetString());
        Assert.Equal(16, doc.GetProperty("states").GetInt64());
        Assert.Equal(logZ, ModelLoader.Load(path).LogPartition!.Value);
    }

    [Theory]
    [InlineData("logz", "--method", "guess")]
    [InlineData("inspect", "--bogus")]
    [InlineData("inspect")]
    public void Usage_errors_exit_2(params string[] args)
    {
        var m = WriteModel(TestModels.Random(ModelKind.Rbm, 3, 2, 1));
        var r = CliRunner.Run(args.Length > 1 ? [args[0], m, .. args[1..]] : args);
        Assert.Equal(2, r.ExitCode);
        Assert.StartsWith("emit: error:", r.Error);
    }

    [Fact]
    public void A_bad_model_is_one_line_with_file_and_line()
    {
        var path = Path.Combine(CliRunner.TempDir(), "bad.json");
        File.WriteAllText(path, "{\"format\":\"emit.model\",\n\"version\":1,\n\"kind\":\"rbm\",\"visible\":2,\"hidden\":1,\n\"visible_bias\":[0,NaN]}");
        var r = CliRunner.Run("inspect", path);
        Assert.Equal(2, r.ExitCode);
        Assert.Matches(@"^emit: error: .*bad\.json:4:\d+: ", r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
    }
}

public sealed class LogzAisCliTests
{
    [Fact]
    public void Ais_reports_an_estimate_with_its_standard_error_and_stores_the_method()
    {
        var m = TestModels.Random(ModelKind.Rbm, 10, 6, 8, scale: 0.4);
        var path = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(m, path, force: true);
        var r = CliRunner.Run("logz", path, "--method", "ais", "--chains", "100", "--steps", "400", "--json", "--store");
        Assert.Equal(0, r.ExitCode);
        var doc = JsonDocument.Parse(r.Out).RootElement;
        double est = doc.GetProperty("log_partition").GetDouble(), se = doc.GetProperty("stderr").GetDouble();
        Assert.InRange(est, Emit.Tests.Reference.BruteForce.LogPartition(m) - 5 * se - 0.01, Emit.Tests.Reference.BruteForce.LogPartition(m) + 5 * se + 0.01);
        var stored = ModelLoader.Load(path).LogPartition!;
        Assert.Equal("ais", stored.Method);
        Assert.Equal(se, stored.Stderr);
    }
}

public sealed class InspectFixedPointTests
{
    [Theory]
    [InlineData("int16")]
    [InlineData("int8")]
    public void Stated_error_bound_holds_for_every_vector_of_a_small_model(string weights)
    {
        // Exhaustive: all 2^10 vectors, integer simulator against the double reference.
        var m = TestModels.Random(ModelKind.Lateral, 10, 6, 3, scale: 0.6, linkDensity: 0.2);
        var path = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(m, path, force: true);
        var r = CliRunner.Run("inspect", path, "--numeric", "fixed", "--weights", weights, "--json");
        Assert.Equal(0, r.ExitCode);
        var doc = JsonDocument.Parse(r.Out).RootElement;
        double bound = doc.GetProperty("error_bound").GetDouble();
        Assert.Equal(weights, doc.GetProperty("fixed_point").GetProperty("weights").GetString());
        Assert.Matches(@"^Q\d+\.\d+$", doc.GetProperty("fixed_point").GetProperty("energy_format").GetString());
        var sim = new Emit.Quantize.FixedPointSimulator(Emit.Quantize.FixedPointPlanner.Build(m, new(Emit.Quantize.WeightTypeInfo.Parse(weights)!.Value)));
        var reference = new Emit.Reference.ReferenceScorer(m);
        double worst = 0;
        for (int bits = 0; bits < 1 << 10; bits++)
        {
            var v = TestModels.Bits(bits, 10);
            worst = Math.Max(worst, Math.Abs(sim.FreeEnergyReal(v) - reference.FreeEnergy(v)));
        }
        Assert.True(worst <= bound, $"measured {worst} > stated {bound}");
        Assert.True(worst > 0);
    }

    /// <summary>
    /// The footprint prediction and the run-time dependencies reach both outputs in every mode, equal to what the generated
    /// header states; the Arm toolchain checks the values (CortexM0Tests, CortexM4FTests).
    /// </summary>
    [Theory]
    [InlineData("fixed", "Cortex-M0", "")]
    [InlineData("f32", "Cortex-M4F", "")] // the f32 softplus is a polynomial (SoftplusF32): no libm
    [InlineData("f64", "Cortex-M4F", "exp, log, fabs")]
    public void Inspect_states_the_predicted_flash_stack_and_dependencies(string numeric, string core, string libm)
    {
        var dir = CliRunner.TempDir();
        var path = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(TestModels.Random(ModelKind.Rbm, 50, 20, 1), path, force: true);
        var json = JsonDocument.Parse(CliRunner.Run("inspect", path, "--numeric", numeric, "--json").Out).RootElement.GetProperty("footprint");
        long flash = json.GetProperty("flash_bytes").GetInt64();
        long stack = json.GetProperty("stack_bytes").GetInt64();
        Assert.Contains(core, json.GetProperty("reference").GetString());
        Assert.Equal(libm, string.Join(", ", json.GetProperty("libm_functions").EnumerateArray().Select(e => e.GetString())));
        Assert.True(flash > 50 * 20 * 2, $"flash {flash} is below the smallest weight table alone");
        Assert.InRange(stack, 20 * 4, 4096);
        var text = CliRunner.Run("inspect", path, "--numeric", numeric).Out;
        Assert.Contains($"flash        {flash} bytes predicted", text);
        Assert.Contains($"stack        {stack} bytes worst case", text);
        Assert.Equal(0, CliRunner.Run("compile", path, "--numeric", numeric, "--name", "m", "--out", dir).ExitCode);
        var header = File.ReadAllText(Path.Combine(dir, "m.h"));
        Assert.Contains($"#define M_FLASH_BYTES {flash}\n#define M_STACK_BYTES {stack}\n", header);
    }

    /// <summary>
    /// What each firmware feature costs (alarm filter, streamed scoring, explanations) reaches both outputs of inspect
    /// in every mode, equal to the figures the header of a scorer compiled with those features states; the Arm
    /// toolchain checks the figures themselves against arm-none-eabi-size (CortexM0FeatureTests).
    /// </summary>
    [Theory]
    [InlineData("fixed", ModelKind.Rbm, "speed")]
    [InlineData("fixed", ModelKind.Lateral, "size")]
    [InlineData("f32", ModelKind.Rbm, "speed")]
    [InlineData("f64", ModelKind.Lateral, "speed")]
    public void Inspect_states_what_each_feature_costs_as_the_header_does(string numeric, ModelKind kind,
        string optimize)
    {
        var dir = CliRunner.TempDir();
        var path = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(TestModels.Random(kind, 30, 12, 3).With(-20.5, null), path, force: true);
        var r = CliRunner.Run("inspect", path, "--numeric", numeric, "--optimize", optimize, "--json");
        Assert.True(r.ExitCode == 0, r.Error);
        var features = JsonDocument.Parse(r.Out).RootElement.GetProperty("footprint").GetProperty("features");
        long Figure(string feature, string field) => features.GetProperty(feature).GetProperty(field).GetInt64();
        Assert.Equal(0, CliRunner.Run("compile", path, "--numeric", numeric, "--optimize", optimize, "--name", "m",
            "--explain", "--alarm-filter", "3/5", "--out", dir).ExitCode);
        var header = File.ReadAllText(Path.Combine(dir, "m.h"));
        long Define(string macro) => long.Parse(
            System.Text.RegularExpressions.Regex.Match(header, $@"#define M_{macro} (\d+)\n").Groups[1].Value,
            System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(Define("FILTER_FLASH_BYTES"), Figure("alarm_filter", "flash_bytes"));
        Assert.Equal(Define("FILTER_RAM_BYTES"), Figure("alarm_filter", "ram_bytes"));
        Assert.Equal(Define("STREAM_FLASH_BYTES"), Figure("stream", "flash_bytes"));
        Assert.Equal(Define("STREAM_BYTES"), Figure("stream", "ram_bytes"));
        Assert.Equal(Define("EXPLAIN_FLASH_BYTES"), Figure("explain", "flash_bytes"));
        Assert.Equal(Define("EXPLAIN_STACK_BYTES"), Figure("explain", "stack_bytes"));
        Assert.Contains("N <= 32", features.GetProperty("alarm_filter").GetProperty("assumption").GetString());
        var text = CliRunner.Run("inspect", path, "--numeric", numeric, "--optimize", optimize).Out;
        Assert.Contains($"  alarm filter flash +{Define("FILTER_FLASH_BYTES")} bytes, RAM {Define("FILTER_RAM_BYTES")} " +
                        "bytes per filter", text);
        Assert.Contains($"  stream       flash +{Define("STREAM_FLASH_BYTES")} bytes, RAM {Define("STREAM_BYTES")} " +
                        "bytes per stream", text);
        Assert.Contains($"  explain      flash +{Define("EXPLAIN_FLASH_BYTES")} bytes beyond the stream code, stack " +
                        $"{Define("EXPLAIN_STACK_BYTES")} bytes", text);
    }

    /// <summary>
    /// What a model adds to a classifier, as inspect states it (per model and once), adds up to the figures the header
    /// of a classifier of three such models states; a 4-byte score in fixed mode with an int32 accumulator and in
    /// f32, an 8-byte one in f64.
    /// </summary>
    [Theory]
    [InlineData("fixed", 4)]
    [InlineData("f32", 4)]
    [InlineData("f64", 8)]
    public void Inspect_states_what_a_model_adds_to_a_classifier_as_the_classifier_header_does(string numeric,
        int scoreBytes)
    {
        var dir = CliRunner.TempDir();
        var paths = Enumerable.Range(0, 3).Select(k =>
        {
            var path = Path.Combine(dir, $"m{k}.json");
            ModelJson.WriteFile(TestModels.Random(ModelKind.Rbm, 20, 6, seed: 30 + k), path, force: true);
            Assert.Equal(0, CliRunner.Run("logz", path, "--store").ExitCode); // a classifier needs each log Z
            return path;
        }).ToArray();
        var r = CliRunner.Run("inspect", paths[0], "--numeric", numeric, "--json");
        Assert.True(r.ExitCode == 0, r.Error);
        var c = JsonDocument.Parse(r.Out).RootElement.GetProperty("footprint").GetProperty("features")
            .GetProperty("classifier");
        long perModel = c.GetProperty("flash_bytes_per_model").GetInt64(), once = c.GetProperty("flash_bytes_once")
            .GetInt64(), ram = c.GetProperty("ram_bytes_per_model").GetInt64();
        Assert.Equal(scoreBytes, ram);
        var compiled = CliRunner.Run(["compile", .. paths, "--numeric", numeric, "--name", "modes", "--out", dir]);
        Assert.True(compiled.ExitCode == 0, compiled.Error);
        var header = File.ReadAllText(Path.Combine(dir, "modes.h"));
        long Define(string macro) => long.Parse(
            System.Text.RegularExpressions.Regex.Match(header, $@"#define MODES_{macro} (\d+)\n").Groups[1].Value,
            System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(once + 3 * perModel, Define("CLASSIFY_FLASH_BYTES"));
        Assert.Equal(3 * ram, Define("CLASSIFY_RAM_BYTES"));
        var text = CliRunner.Run("inspect", paths[0], "--numeric", numeric).Out;
        Assert.Contains($"  classifier   flash +{perModel} bytes and RAM {ram} bytes per model scored, plus {once} " +
                        "bytes of flash once", text);
    }

    [Fact]
    public void Inspect_says_stream_and_explain_do_not_apply_to_a_general_model()
    {
        var path = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(TestModels.Random(ModelKind.General, 6, 3, 1), path, force: true);
        var r = CliRunner.Run("inspect", path, "--numeric", "f64", "--json");
        Assert.True(r.ExitCode == 0, r.Error);
        var features = JsonDocument.Parse(r.Out).RootElement.GetProperty("footprint").GetProperty("features");
        Assert.Equal(JsonValueKind.Null, features.GetProperty("stream").ValueKind);
        Assert.Equal(JsonValueKind.Null, features.GetProperty("explain").ValueKind);
        Assert.Equal(JsonValueKind.Object, features.GetProperty("alarm_filter").ValueKind);
        Assert.Contains("not for kind general", CliRunner.Run("inspect", path, "--numeric", "f64").Out);
    }

    [Fact]
    public void Bad_fixed_point_options_exit_2()
    {
        var path = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(TestModels.Random(ModelKind.Rbm, 4, 2, 1), path, force: true);
        Assert.Equal(2, CliRunner.Run("inspect", path, "--numeric", "fixed", "--softplus-table", "100").ExitCode);
        Assert.Equal(2, CliRunner.Run("inspect", path, "--numeric", "fixed", "--weights", "int4").ExitCode);
    }
}
