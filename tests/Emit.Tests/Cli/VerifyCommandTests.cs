using System.Globalization;
using System.Text.Json;
using System.Text.RegularExpressions;
using System.Xml.Linq;
using Emit.Emission;
using Emit.Quantize;
using Emit.Harness;
using Emit.Model;
using Emit.Reference;
using Emit.Tests.Emission;
using Emit.Tests.Harness;
using Json.Schema;

namespace Emit.Tests.Cli;

/// <summary><c>emit verify</c> end to end: exit codes, the reports, existing sources, missing tools (§4, §6).</summary>
public sealed class VerifyCommandTests
{
    private static readonly CodegenCases.Case Lateral = CodegenCases.All.Single(x => x.Id == "lat_a");

    /// <summary>A folder with the model file and its generated test vectors.</summary>
    private static (string Dir, string Model, string Vectors) Setup(string what, BoltzmannModel model, int count = 40)
    {
        var dir = Toolchain.TempDir(what);
        var path = Path.Combine(dir, "plant.json");
        ModelJson.WriteFile(model, path, force: true);
        var vectors = VerifyCases.WriteVectors(dir, TestVectorSet.Generate(model, new TestVectorOptions(count, Seed: 3)).Select(v => v.Units));
        return (dir, path, vectors);
    }

    private static void Compile(string model, string outDir, string targets, string numeric)
    {
        var r = CliRunner.Run("compile", model, "--target", targets, "--numeric", numeric, "--out", outDir);
        Assert.True(r.ExitCode == 0, r.Error);
    }

    // ---- the JSON schema (docs/verify-report.schema.json), checked with an outside validator (JsonSchema.Net) ----

    private static readonly Lazy<JsonSchema> Schema = new(() =>
    {
        var dir = AppContext.BaseDirectory;
        while (!File.Exists(Path.Combine(dir, "docs", "verify-report.schema.json"))) dir = Path.GetDirectoryName(dir)!;
        return JsonSchema.FromText(File.ReadAllText(Path.Combine(dir, "docs", "verify-report.schema.json")));
    });

    internal static JsonElement ReadReport(string path)
    {
        var doc = JsonDocument.Parse(File.ReadAllText(path));
        var result = Schema.Value.Evaluate(doc.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(result.IsValid, "report does not match docs/verify-report.schema.json: " +
            string.Join("; ", (result.Details ?? []).Where(d => d.Errors is not null).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}"))));
        return doc.RootElement;
    }

    private static JsonElement Target(JsonElement report, string name) =>
        report.GetProperty("targets").EnumerateArray().Single(t => t.GetProperty("target").GetString() == name);

    /// <summary>
    /// The element and attribute names of the common JUnit XML format, as the junit-10.xsd schema of the Jenkins xunit
    /// plugin (jenkinsci/xunit-plugin, MIT) defines them: testsuites (name, time, tests, failures, disabled, errors) holds
    /// testsuite elements (tests required; name, failures, errors, time, skipped, ... optional) holding properties/property
    /// (name and value required), testcase (name required; classname, time, ... optional), system-out, system-err; a
    /// testcase holds skipped, error, failure (type, message optional; mixed text), system-out, system-err.
    /// </summary>
    private static XDocument CheckJUnitShape(string path)
    {
        var doc = XDocument.Load(path);
        var root = doc.Root!;
        Assert.Equal("testsuites", root.Name.LocalName);
        Assert.Equal(XNamespace.None, root.Name.Namespace);
        Assert.Subset(new HashSet<string> { "name", "time", "tests", "failures", "disabled", "errors" }, Attrs(root));
        foreach (var suite in root.Elements())
        {
            Assert.Equal("testsuite", suite.Name.LocalName);
            Assert.NotNull(suite.Attribute("tests"));
            Assert.Subset(new HashSet<string> { "name", "tests", "failures", "errors", "time", "disabled", "skipped", "skips", "timestamp", "hostname", "id", "package", "assertions", "file", "skip", "log", "url" }, Attrs(suite));
            foreach (var child in suite.Elements())
            {
                Assert.Contains(child.Name.LocalName, new[] { "testsuite", "properties", "testcase", "system-out", "system-err" });
                if (child.Name.LocalName == "properties")
                    foreach (var p in child.Elements())
                    {
                        Assert.Equal("property", p.Name.LocalName);
                        Assert.Equal(new HashSet<string> { "name", "value" }, Attrs(p));
                    }
                if (child.Name.LocalName != "testcase") continue;
                Assert.NotNull(child.Attribute("name"));
                Assert.Subset(new HashSet<string> { "name", "assertions", "time", "timestamp", "classname", "status", "class", "file", "line", "log", "group", "url" }, Attrs(child));
                foreach (var inner in child.Elements())
                {
                    Assert.Contains(inner.Name.LocalName, new[] { "skipped", "error", "failure", "system-out", "system-err" });
                    if (inner.Name.LocalName is "failure" or "error" or "skipped")
                        Assert.Subset(new HashSet<string> { "type", "message" }, Attrs(inner));
                }
            }
            // counts agree with the content (Ant's JUnit formatter convention; common practice)
            var cases = suite.Elements("testcase").ToList();
            Assert.Equal(cases.Count, int.Parse(suite.Attribute("tests")!.Value, CultureInfo.InvariantCulture));
            Assert.Equal(cases.Count(c => c.Element("failure") is not null), int.Parse(suite.Attribute("failures")!.Value, CultureInfo.InvariantCulture));
            foreach (var time in cases.Select(c => c.Attribute("time")!.Value).Append(suite.Attribute("time")!.Value))
                Assert.True(double.TryParse(time, NumberStyles.Float, CultureInfo.InvariantCulture, out var t) && t >= 0, time);
        }
        return doc;
    }

    private static HashSet<string> Attrs(XElement e) => e.Attributes().Select(a => a.Name.LocalName).ToHashSet();

    [Fact]
    public void Feature_results_appear_in_every_report_and_match_the_schema_and_the_junit_shape()
    {
        var model = new BoltzmannModel(ModelKind.Rbm, 2, 0, [1.0, 0.5], [], [],
            System.Collections.Immutable.ImmutableArray<Link>.Empty, System.Collections.Immutable.ImmutableArray<Link>.Empty);
        var c = new TargetComparison(NumericExpectation.For(model, NumericMode.F64, null));
        c.Add(0, -1.0, null, new ScoredRow(BitConverter.DoubleToUInt64Bits(-1.0), true, -1));
        FeatureResult[] features =
        [
            new("filter", 12, 0, "decisions through a 2-of-3 filter", []),
            new("stream", 5, 2, "random flip walks", ["walk 0 step 3: differs"]),
        ];
        var target = c.Finish("c", null, true, model.Sha256, 0, [], 0.5, 0.25, features: features);
        var report = new VerifyReport
        {
            ToolVersion = "0.0.0", Model = "m.json", ModelSha256 = model.Sha256, Input = "v.csv", Vectors = 1,
            Targets = [target], Warnings = [],
        };
        var dir = Toolchain.TempDir("features");
        var json = Path.Combine(dir, "r.json");
        using (var f = File.Create(json))
        using (var w = new Utf8JsonWriter(f)) ReportJson.Write(report, w);
        var listed = Target(ReadReport(json), "c").GetProperty("features").EnumerateArray().ToList();
        Assert.Equal(["filter", "stream"], listed.Select(f => f.GetProperty("feature").GetString()));
        Assert.False(listed[1].GetProperty("passed").GetBoolean());
        Assert.Equal(2, listed[1].GetProperty("mismatches").GetInt64());

        var xml = Path.Combine(dir, "r.xml");
        using (var f = File.Create(xml)) ReportJUnit.Write(report, f);
        var cases = CheckJUnitShape(xml).Descendants("testcase").ToList();
        Assert.Equal(3, cases.Count);
        Assert.NotNull(cases.Single(x => x.Attribute("name")!.Value == "c f64 f64 stream").Element("failure"));
        Assert.Null(cases.Single(x => x.Attribute("name")!.Value == "c f64 f64 filter").Element("failure"));

        var text = new StringWriter();
        ReportText.Write(report, text);
        Assert.Contains("c filter: 12 checked, 0 mismatches", text.ToString(), StringComparison.Ordinal);
        Assert.Contains("c stream: 5 checked, 2 mismatches", text.ToString(), StringComparison.Ordinal);
    }

    // ---- a good model ----

    [SkippableFact]
    public void A_good_model_passes_every_target_with_exit_0_and_writes_all_three_reports()
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var (dir, model, vectors) = Setup("verify-good", Lateral.Model);
        string json = Path.Combine(dir, "r.json"), junit = Path.Combine(dir, "r.xml"), png = Path.Combine(dir, "r.png");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--target", "c,csharp,cortex-m3", "--numeric", "f32",
            "--report", json, "--junit", junit, "--plot", png);
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        Assert.Matches(@"(?m)^c\s+f32\s+f32\s+40\s", r.Out);
        Assert.Matches(@"(?m)^cortex-m3\s+f32\s+f32\s+40\s.*pass$", r.Out);
        Assert.Contains("all 3 targets agree", r.Out);
        Assert.Contains("monitoring aid, not a safety function", r.Out);

        var report = ReadReport(json);
        Assert.True(report.GetProperty("passed").GetBoolean());
        Assert.Equal(ModelJson.Read(model).Sha256, report.GetProperty("model_sha256").GetString());
        foreach (var t in report.GetProperty("targets").EnumerateArray())
        {
            Assert.True(t.GetProperty("passed").GetBoolean());
            Assert.Equal(40, t.GetProperty("vectors").GetInt64());
            Assert.True(t.GetProperty("max_abs_error").GetDouble() <= t.GetProperty("error_bound").GetDouble());
            Assert.Equal(JsonValueKind.Null, t.GetProperty("bit_exact").ValueKind);
        }

        var xml = CheckJUnitShape(junit);
        Assert.Equal(3, xml.Descendants("testcase").Count());
        Assert.Empty(xml.Descendants("failure"));

        var bytes = File.ReadAllBytes(png);
        Assert.True(bytes.Length > 1000);
        Assert.Equal(new byte[] { 0x89, (byte)'P', (byte)'N', (byte)'G', 0x0D, 0x0A, 0x1A, 0x0A }, bytes[..8]);   // PNG signature (RFC 2083 §3.1)
    }

    // ---- one changed weight ----

    /// <summary>
    /// One weight of the generated C is changed by 0.5 (the C# is left alone): the C targets fail, the C# target passes,
    /// exit 1, and the report gives the size of the difference, which is checked against the reference scorer run on a
    /// model with the same change.
    /// </summary>
    [SkippableFact]
    public void A_generated_file_with_one_changed_weight_fails_with_exit_1_and_the_report_says_which_target_and_by_how_much()
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var m = Lateral.Model;
        var (dir, model, vectors) = Setup("verify-damaged", m);
        var gen = Path.Combine(dir, "gen");
        Compile(model, gen, "c,csharp", "f64");
        var path = Path.Combine(gen, "plant.c");
        var text = File.ReadAllText(path);
        int table = text.IndexOf("plant_weights[", StringComparison.Ordinal);
        var literal = Regex.Match(text[table..], @"\n\s+(-?[0-9.e+-]+),");
        double original = double.Parse(literal.Groups[1].Value, CultureInfo.InvariantCulture);
        Assert.Equal(m.Weight(0, 0), original);                    // the first literal of the table is W(0,0)
        double changed = original + 0.5;
        int at = table + literal.Groups[1].Index;
        File.WriteAllText(path, text[..at] + Literals.Of(changed, NumericMode.F64) + text[(at + literal.Groups[1].Length)..]);

        string json = Path.Combine(dir, "r.json"), junit = Path.Combine(dir, "r.xml");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c,csharp,cortex-m3",
            "--report", json, "--junit", junit);
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        Assert.Contains("FAIL c: largest |error|", r.Out);
        Assert.Contains("FAIL cortex-m3: largest |error|", r.Out);
        Assert.DoesNotContain("FAIL csharp", r.Out);

        // the size expected: the reference scorer on the model with the same change, over the same vectors
        var weights = m.Weights.ToArray();
        weights[0] = changed;
        var damaged = new ReferenceScorer(new BoltzmannModel(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, [.. weights], m.VisibleLinks, m.HiddenLinks));
        var reference = new ReferenceScorer(m);
        double expected = 0;
        using (var reader = Emit.Vectors.VectorReader.Open(vectors, m.Visible))
        {
            var units = new byte[m.Visible];
            while (reader.TryRead(units)) expected = Math.Max(expected, Math.Abs(damaged.FreeEnergy(units) - reference.FreeEnergy(units)));
        }
        Assert.True(expected > 0.01, $"the change should matter on these vectors ({expected})");

        var report = ReadReport(json);
        Assert.False(report.GetProperty("passed").GetBoolean());
        foreach (var name in new[] { "c", "cortex-m3" })
        {
            var t = Target(report, name);
            Assert.False(t.GetProperty("passed").GetBoolean());
            double max = t.GetProperty("max_abs_error").GetDouble(), bound = t.GetProperty("error_bound").GetDouble();
            Assert.True(max > bound);
            Assert.True(Math.Abs(max - expected) <= 2 * bound, $"{name}: reported {max:R}, expected {expected:R}");
            Assert.Contains(t.GetProperty("failures").EnumerateArray(), f => f.GetString()!.Contains("above the bound", StringComparison.Ordinal));
            Assert.Equal("f64", t.GetProperty("numeric").GetString());      // taken from the sources' banner
        }
        Assert.True(Target(report, "csharp").GetProperty("passed").GetBoolean());

        var xml = CheckJUnitShape(junit);
        var failed = xml.Descendants("testcase").Where(c => c.Element("failure") is not null).Select(c => c.Attribute("name")!.Value).ToList();
        Assert.Equal(["c f64 f64", "cortex-m3 f64 f64"], failed);
        // the first reason is the edit (found by regenerating the sources); the numbers follow
        Assert.All(xml.Descendants("failure"), f => Assert.Contains("plant.c: edited after generation", f.Attribute("message")!.Value));
        Assert.All(xml.Descendants("failure"), f => Assert.Contains("above the bound", f.Value));
    }

    /// <summary>
    /// Fixed point from existing sources: the numeric mode and the weight width come from the sources' banner; one
    /// weight changed by one unit in the last place fails the C targets for not being bit-exact, even where the error
    /// stays within the proved bound.
    /// </summary>
    [SkippableFact]
    public void Fixed_point_sources_are_checked_bit_for_bit_and_one_changed_integer_fails()
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var (dir, model, vectors) = Setup("verify-fixed", Lateral.Model);
        var gen = Path.Combine(dir, "gen");
        var compiled = CliRunner.Run("compile", model, "--target", "c,csharp", "--numeric", "fixed", "--weights", "int8", "--out", gen);
        Assert.True(compiled.ExitCode == 0, compiled.Error);
        var json = Path.Combine(dir, "r.json");
        var good = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c,cortex-m3", "--report", json);
        Assert.True(good.ExitCode == 0, good.Out + good.Error);
        foreach (var t in ReadReport(json).GetProperty("targets").EnumerateArray())
        {
            Assert.Equal("fixed", t.GetProperty("numeric").GetString());
            Assert.Equal("int8", t.GetProperty("weights").GetString());
            Assert.True(t.GetProperty("bit_exact").GetBoolean());
        }

        var path = Path.Combine(gen, "plant.c");
        var text = File.ReadAllText(path);
        int table = text.IndexOf("plant_weights[", StringComparison.Ordinal);
        var literal = Regex.Match(text[table..], @"\n\s+(-?[0-9]+),");
        long value = long.Parse(literal.Groups[1].Value, CultureInfo.InvariantCulture);
        long changed = value == 127 ? 126 : value + 1;
        int at = table + literal.Groups[1].Index;
        File.WriteAllText(path, text[..at] + changed.ToString(CultureInfo.InvariantCulture) + text[(at + literal.Groups[1].Length)..]);
        var bad = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c,csharp,cortex-m3", "--report", json);
        Assert.True(bad.ExitCode == 1, bad.Out + bad.Error);
        var report = ReadReport(json);
        foreach (var name in new[] { "c", "cortex-m3" })
        {
            var t = Target(report, name);
            Assert.False(t.GetProperty("passed").GetBoolean());
            Assert.False(t.GetProperty("bit_exact").GetBoolean());
            Assert.True(t.GetProperty("bit_mismatches").GetInt64() > 0);
            Assert.Contains(t.GetProperty("failures").EnumerateArray(), f => f.GetString()!.Contains("differ from the integer simulator", StringComparison.Ordinal));
        }
        Assert.True(Target(report, "csharp").GetProperty("bit_exact").GetBoolean());
    }

    // ---- existing sources from another model ----

    /// <summary>
    /// Sources generated from another version of the model fail with exit 1 and both hashes, without being run; with
    /// --allow-model-change the numbers are compared as before (here they agree: only the threshold changed).
    /// </summary>
    [SkippableFact]
    public void Sources_of_another_model_fail_naming_both_hashes_unless_a_model_change_is_allowed()
    {
        VerifyCases.Require("c");
        var a = TestModels.Random(ModelKind.Rbm, 20, 6, seed: 8);
        var (dir, modelA, vectors) = Setup("verify-hash", a, count: 20);
        var gen = Path.Combine(dir, "gen");
        Compile(modelA, gen, "c", "f32");
        var b = a.With(threshold: 1.5, null);       // the same numbers, another identity
        var modelB = Path.Combine(dir, "plant-recalibrated.json");
        ModelJson.WriteFile(b, modelB, force: true);
        Assert.NotEqual(a.Sha256, b.Sha256);
        var json = Path.Combine(dir, "r.json");

        var strict = CliRunner.Run("verify", modelB, "--input", vectors, "--generated", gen, "--name", "plant", "--report", json);
        Assert.True(strict.ExitCode == 1, strict.Out + strict.Error);
        Assert.Contains($"FAIL c: plant.h, plant.c were generated from model sha256 {a.Sha256} (plant.json), but plant-recalibrated.json has sha256 {b.Sha256}", strict.Out);
        var report = ReadReport(json);
        Assert.False(report.GetProperty("passed").GetBoolean());
        Assert.False(report.GetProperty("allow_model_change").GetBoolean());
        var t = Target(report, "c");
        Assert.False(t.GetProperty("compared").GetBoolean());
        Assert.False(t.GetProperty("model_hash_matches").GetBoolean());
        Assert.Equal(a.Sha256, t.GetProperty("source_model_sha256").GetString());
        Assert.Equal(0, t.GetProperty("vectors").GetInt64());
        Assert.False(t.GetProperty("passed").GetBoolean());

        var r = CliRunner.Run("verify", modelB, "--input", vectors, "--generated", gen, "--name", "plant", "--allow-model-change", "--report", json);
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        Assert.Contains($"emit: warning: plant.h, plant.c: generated from model {a.Sha256}", r.Error);
        Assert.Contains("the numbers are compared all the same", r.Error);
        report = ReadReport(json);
        Assert.True(report.GetProperty("allow_model_change").GetBoolean());
        t = Target(report, "c");
        Assert.True(t.GetProperty("compared").GetBoolean());
        Assert.False(t.GetProperty("model_hash_matches").GetBoolean());
        Assert.Equal(a.Sha256, t.GetProperty("source_model_sha256").GetString());
        Assert.Equal(20, t.GetProperty("vectors").GetInt64());
        Assert.True(t.GetProperty("passed").GetBoolean());
    }

    // ---- crashes, faults, hangs ----

    /// <summary>
    /// Failure <paramref name="index"/> of a target whose sources were broken by hand: failure 0 is always the edit
    /// ("edited after generation", found by regenerating), the run's own failures follow.
    /// </summary>
    private static string Failure(JsonElement report, string target, int index)
    {
        var failures = Target(report, target).GetProperty("failures");
        Assert.Contains("plant.c: edited after generation", failures[0].GetString());
        return failures[index].GetString()!;
    }

    private static string BreakScorer(string what, string statement)
    {
        var (dir, model, vectors) = Setup(what, Lateral.Model, count: 5);
        var gen = Path.Combine(dir, "gen");
        Compile(model, gen, "c", "f32");
        var path = Path.Combine(gen, "plant.c");
        var text = File.ReadAllText(path);
        var head = "plant_energy_t plant_free_energy(const uint8_t packed[PLANT_PACKED_BYTES])\n{\n";
        Assert.Contains(head, text);
        File.WriteAllText(path, text.Replace(head, head + "    " + statement + "\n", StringComparison.Ordinal));
        return string.Join('\n', dir, model, vectors, gen);
    }

    [SkippableFact]
    public void A_scorer_that_faults_fails_with_the_signal_on_the_host_and_the_fault_status_on_the_emulator()
    {
        VerifyCases.Require("c", "cortex-m3");
        var p = BreakScorer("verify-fault", "{ volatile uint32_t *bad = (volatile uint32_t *)(uintptr_t)0xFFFFFFF0u; *bad = 1u; }").Split('\n');
        var json = Path.Combine(p[0], "r.json");
        var r = CliRunner.Run("verify", p[1], "--input", p[2], "--generated", p[3], "--target", "c,cortex-m3", "--report", json);
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        var report = ReadReport(json);
        Assert.Contains("killed by signal", Failure(report, "c", 1));
        Assert.Contains($"took a fault on the emulated Cortex-M3 (qemu exit status {HarnessTemplates.FaultStatus})", Failure(report, "cortex-m3", 1));
    }

    [SkippableFact]
    public void A_scorer_that_hangs_is_stopped_by_the_time_limit()
    {
        VerifyCases.Require("c", "cortex-m3");
        var p = BreakScorer("verify-hang", "{ volatile int spin = 1; while (spin) { } }").Split('\n');
        var json = Path.Combine(p[0], "r.json");
        var r = CliRunner.Run("verify", p[1], "--input", p[2], "--generated", p[3], "--target", "c,cortex-m3", "--timeout", "5", "--report", json);
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        var report = ReadReport(json);
        Assert.Contains("did not answer within 5 s", Failure(report, "c", 1));
        Assert.Contains("qemu did not finish image 1 within 5 s", Failure(report, "cortex-m3", 1));
    }

    [SkippableFact]
    public void Generated_code_that_does_not_compile_fails_the_target_with_the_compiler_message()
    {
        VerifyCases.Require("c");
        var p = BreakScorer("verify-syntax", "this is not C;").Split('\n');
        var r = CliRunner.Run("verify", p[1], "--input", p[2], "--generated", p[3]);
        Assert.Equal(1, r.ExitCode);
        Assert.Contains("FAIL c: the generated C does not compile", r.Out);
    }

    // ---- input ----

    [SkippableFact]
    public void Vectors_can_come_from_standard_input()
    {
        VerifyCases.Require("c");
        var (_, model, vectors) = Setup("verify-stdin", Lateral.Model, count: 12);
        var r = CliRunner.RunWithInput(File.ReadAllText(vectors), "verify", model, "--input", "-", "--numeric", "f64");
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        Assert.Contains("12 vectors from stdin", r.Out);
    }

    [Theory]
    [InlineData("--target", "c,riscv", "--target: 'riscv' is not one of c, csharp, cortex-m3")]
    [InlineData("--numeric", "f16", "--numeric: 'f16' is not one of f32, f64, fixed")]
    [InlineData("--weights", "int8", "apply to --numeric fixed")]
    [InlineData("--timeout", "0", "--timeout: '0' is not a whole number from 1 to 86400")]
    public void Bad_options_are_exit_2(string option, string value, string message)
    {
        var (_, model, vectors) = Setup("verify-bad", Lateral.Model, count: 4);
        var r = CliRunner.Run("verify", model, "--input", vectors, option, value);
        Assert.Equal(2, r.ExitCode);
        Assert.Contains(message, r.Error);
    }

    [SkippableFact]
    public void Numeric_mode_contradicting_the_sources_is_exit_2()
    {
        var (dir, model, vectors) = Setup("verify-mode", Lateral.Model, count: 4);
        var gen = Path.Combine(dir, "gen");
        Compile(model, gen, "c", "f32");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--numeric", "f64", "--cc", Toolchain.Require("cc"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("plant.c was generated with --numeric f32, not f64 (pass --numeric f32", r.Error);
    }

    // ---- missing tools: exit 2, and the message names the Debian package ----

    [Fact]
    public void A_missing_c_compiler_is_exit_2_and_names_the_package()
    {
        var (dir, model, vectors) = Setup("verify-nocc", Lateral.Model, count: 4);
        var r = CliRunner.Run("verify", model, "--input", vectors, "--cc", Path.Combine(dir, "no-such-cc"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("target c: C compiler", r.Error);
        Assert.Contains("install the Debian package gcc (apt-get install gcc)", r.Error);
    }

    /// <summary>Runs the emit executable in a child process with PATH set to <paramref name="path"/> only.</summary>
    private static ProcessResult RunWithPath(string path, params string[] args)
    {
        var dotnet = Toolchain.Require("dotnet");
        var psi = ExternalProcess.StartInfo(dotnet, [typeof(Emit.Cli.CliApp).Assembly.Location, .. args], null, redirectInput: false);
        psi.Environment["PATH"] = path;
        psi.Environment["DOTNET_ROOT"] = Path.GetDirectoryName(new FileInfo(dotnet).ResolveLinkTarget(true)?.FullName ?? dotnet);
        using var p = System.Diagnostics.Process.Start(psi)!;
        var o = p.StandardOutput.ReadToEndAsync();
        var e = p.StandardError.ReadToEndAsync();
        Assert.True(p.WaitForExit(TimeSpan.FromMinutes(2)));
        return new ProcessResult(p.ExitCode, o.Result, e.Result, false, 0);
    }

    private static string FakeBin(string dir, params (string Name, string? Target)[] tools)
    {
        var bin = Path.Combine(dir, "bin");
        Directory.CreateDirectory(bin);
        foreach (var (name, target) in tools)
        {
            var file = Path.Combine(bin, name);
            if (target is null)
            {
                // stands in for a cross compiler without newlib: -print-file-name echoes the bare name when the file is missing
                File.WriteAllText(file, "#!/bin/sh\necho rdimon.specs\n");
                if (!OperatingSystem.IsWindows()) File.SetUnixFileMode(file, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
            }
            else File.CreateSymbolicLink(file, target);
        }
        return bin;
    }

    [SkippableTheory]
    [InlineData("cortex-m3", "none", "install the Debian package gcc-arm-none-eabi (apt-get install gcc-arm-none-eabi)")]
    [InlineData("cortex-m3", "gcc", "install the Debian package qemu-system-arm (apt-get install qemu-system-arm)")]
    [InlineData("cortex-m3", "gcc-without-newlib", "install the Debian package libnewlib-arm-none-eabi (apt-get install libnewlib-arm-none-eabi)")]
    [InlineData("csharp", "none", "install the Debian package dotnet-sdk-10.0")]
    public void A_missing_tool_is_exit_2_and_names_the_package(string target, string present, string hint)
    {
        var (dir, model, vectors) = Setup("verify-notool", Lateral.Model, count: 4);
        var tools = new List<(string, string?)>();
        if (present == "gcc") tools.AddRange([("arm-none-eabi-gcc", Toolchain.Require("arm-none-eabi-gcc"))]);
        if (present == "gcc-without-newlib") tools.AddRange([("arm-none-eabi-gcc", null), ("qemu-system-arm", Toolchain.Require("qemu-system-arm"))]);
        var r = RunWithPath(FakeBin(dir, [.. tools]), "verify", model, "--input", vectors, "--target", target);
        Assert.True(r.ExitCode == 2, r.Out + r.Err);
        Assert.Contains(hint, r.Err);
        Assert.StartsWith("emit: error: target " + target + ":", r.Err);
    }
}
