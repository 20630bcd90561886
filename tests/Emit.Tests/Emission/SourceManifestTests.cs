using System.Globalization;
using System.Text.Json;
using System.Text.RegularExpressions;
using Emit.Quantize;
using Emit.Emission;
using Emit.Model;
using Emit.Tests.Cli;
using Json.Schema;

namespace Emit.Tests.Emission;

/// <summary>
/// The manifest <c>NAME.emit.json</c> that compile and build write beside the sources (docs/manifest.md): it matches
/// its JSON Schema (checked with an outside validator, JsonSchema.Net), its hashes are those sha256sum (GNU coreutils)
/// prints for the files and the shipped templates, its facts agree with what the generated header states, and the
/// reader gives back what the writer wrote.
/// </summary>
public sealed class SourceManifestTests
{
    private static readonly Lazy<JsonSchema> Schema = new(() =>
    {
        var dir = AppContext.BaseDirectory;
        while (!File.Exists(Path.Combine(dir, "docs", "manifest.schema.json"))) dir = Path.GetDirectoryName(dir)!;
        return JsonSchema.FromText(File.ReadAllText(Path.Combine(dir, "docs", "manifest.schema.json")));
    });

    private static string RepoRoot()
    {
        var dir = AppContext.BaseDirectory;
        while (!Directory.Exists(Path.Combine(dir, "templates", "c"))) dir = Path.GetDirectoryName(dir)!;
        return dir;
    }

    /// <summary>Compiles the lateral test model (with a threshold) into a new folder; returns the folder.</summary>
    private static string CompileTo(string what, params string[] options)
    {
        var dir = Toolchain.TempDir(what);
        var model = Path.Combine(dir, "plant.json");
        ModelJson.WriteFile(GoldenFileTests.SmallLateral(), model, force: true);
        var r = CliRunner.Run(["compile", model, "--out", Path.Combine(dir, "gen"), .. options]);
        Assert.True(r.ExitCode == 0, r.Error);
        return Path.Combine(dir, "gen");
    }

    /// <summary>Fails unless <paramref name="json"/> matches docs/manifest.schema.json.</summary>
    internal static void AssertValid(string json)
    {
        using var doc = JsonDocument.Parse(json);
        var result = Schema.Value.Evaluate(doc.RootElement, new EvaluationOptions { OutputFormat = OutputFormat.List });
        Assert.True(result.IsValid, "manifest does not match docs/manifest.schema.json: " +
            string.Join("; ", (result.Details ?? []).Where(d => d.Errors is not null).SelectMany(d => d.Errors!.Select(e => $"{d.InstanceLocation}: {e.Value}"))));
    }

    public static TheoryData<string[]> Options() => new()
    {
        new[] { "--target", "c,csharp", "--numeric", "f32" },
        new[] { "--target", "c", "--numeric", "f64", "--name", "pump_a", "--selftest-vectors", "3" },
        new[] { "--target", "c,csharp", "--numeric", "fixed", "--weights", "int8", "--softplus-table", "512" },
        new[] { "--target", "csharp", "--numeric", "fixed", "--accumulator", "int64", "--namespace", "Plant.Monitoring" },
    };

    [Theory]
    [MemberData(nameof(Options))]
    public void Compile_writes_a_manifest_that_matches_its_schema_and_lists_every_file_with_its_sha256(string[] options)
    {
        var gen = CompileTo("manifest", options);
        var manifests = Directory.GetFiles(gen, "*.emit.json");
        var path = Assert.Single(manifests);
        var text = File.ReadAllText(path);
        AssertValid(text);
        var m = SourceManifestJson.Read(text, path);
        Assert.Equal(Path.GetFileName(path), m.Name + ".emit.json");

        // every other file in the folder (but emit's ledger) is listed, and sha256sum agrees with each hash
        var listed = m.Files.Select(f => f.File).Order(StringComparer.Ordinal).ToArray();
        var present = Directory.GetFiles(gen).Select(Path.GetFileName).Where(n => n != Path.GetFileName(path) && n != WrittenLedger.FileName).Order(StringComparer.Ordinal).ToArray();
        Assert.Equal(present, listed);
        var sums = Toolchain.RunOk(Toolchain.Require("sha256sum"), m.Files.Select(f => f.File), workDir: gen);
        foreach (var f in m.Files)
        {
            Assert.Contains($"{f.Sha256}  {f.File}\n", sums);
            Assert.Equal(new FileInfo(Path.Combine(gen, f.File)).Length, f.Bytes);
        }

        // the shipped templates' hashes are those of the files under templates/ in the repository
        var root = RepoRoot();
        Assert.NotEmpty(m.Templates);
        foreach (var t in m.Templates)
        {
            Assert.False(t.Custom);
            var sum = Toolchain.RunOk(Toolchain.Require("sha256sum"), [Path.Combine(root, "templates", t.Target, t.File)]);
            Assert.StartsWith(t.Sha256 + "  ", sum);
        }
        Assert.Equal(m.Targets.ToHashSet(), m.Templates.Select(t => t.Target).ToHashSet());
    }

    [Fact]
    public void The_facts_agree_with_what_the_generated_header_states()
    {
        var gen = CompileTo("manifest-facts", "--target", "c", "--numeric", "fixed", "--weights", "int16");
        var m = SourceManifestJson.ReadFile(Path.Combine(gen, "plant.emit.json"));
        var header = File.ReadAllText(Path.Combine(gen, "plant.h"));
        // the header is read here only to cross-check the manifest; the harness never does this
        long Macro(string name) => long.Parse(Regex.Match(header, $@"#define PLANT_{name} \(?(?:\(plant_energy_t\))?\(?(-?\d+)").Groups[1].Value, CultureInfo.InvariantCulture);
        Assert.Equal(Math.ScaleB(1.0, (int)Macro("ENERGY_FRACTION_BITS")), m.EnergyScale);
        Assert.Equal(Macro("THRESHOLD"), m.ThresholdUnits);
        Assert.Equal(Math.Min((long)Math.Floor(4.5 * m.EnergyScale), Macro("ENERGY_MAX")), m.ThresholdUnits!.Value);   // floor(t · 2^E), clamped to the reachable range
        Assert.Equal(4.5, m.Threshold);
        Assert.Equal(Macro("VISIBLE"), m.Visible);
        Assert.Equal(Macro("HIDDEN"), m.Hidden);
        Assert.Equal(NumericMode.Fixed, m.Numeric);
        Assert.Equal("int16", m.Weights);
        Assert.Contains($"typedef {m.Accumulator}_t plant_energy_t", header);
        Assert.Equal(ModelJson.Read(Path.Combine(Path.GetDirectoryName(gen)!, "plant.json")).Sha256, m.ModelSha256);
        Assert.Contains("model sha256: " + m.ModelSha256, header);
        var bound = double.Parse(Regex.Match(header, @"#define PLANT_ERROR_BOUND (\S+)").Groups[1].Value.TrimEnd('f'), CultureInfo.InvariantCulture);
        Assert.True(Math.Abs(bound - m.ErrorBound) <= 1e-6 * m.ErrorBound, $"{bound} vs {m.ErrorBound}");
    }

    [Fact]
    public void Reading_gives_back_what_was_written_and_writing_again_the_same_bytes()
    {
        foreach (var mode in new[] { NumericMode.F32, NumericMode.Fixed })
        {
            var compiled = ScorerCompiler.Build(GoldenFileTests.SmallLateral(), "*/ evil\n\"plant\".json", new CompileOptions(["c", "csharp"], mode, "plant"));
            var text = compiled.ManifestFile.Text;
            var back = SourceManifestJson.Read(text, "plant.emit.json");
            Assert.Equal(text, SourceManifestJson.Write(back));
            Assert.Equal("*/ evil\n\"plant\".json", back.ModelFile);
            Assert.Equal(compiled.Manifest.Files, back.Files);
            Assert.Equal(compiled.Manifest.Templates, back.Templates);
            Assert.Equal(compiled.Manifest.Fixed, back.Fixed);
            Assert.Equal(compiled.Manifest.ErrorBound, back.ErrorBound);      // shortest round-trip number text
            Assert.Equal("Plant", back.CSharpClass);
            // the same model and options give the same manifest bytes (no timestamp, no paths)
            Assert.Equal(text, ScorerCompiler.Build(GoldenFileTests.SmallLateral(), "*/ evil\n\"plant\".json", new CompileOptions(["c", "csharp"], mode, "plant")).ManifestFile.Text);
        }
    }

    [Theory]
    [InlineData("\"format\": \"emit.manifest\"", "\"format\": \"emit.project\"", "not an emit manifest")]
    [InlineData("\"version\": 1", "\"version\": 2", "manifest version 2 is not the version 1")]
    [InlineData("\"numeric\": \"f32\"", "\"numeric\": \"f16\"", "options.numeric \"f16\" is unknown")]
    [InlineData("\"error_bound\"", "\"error_bound_x\"", "field scorer.error_bound is missing")]
    [InlineData("{", "[", "the manifest is not valid JSON")]
    [InlineData("\"format\"", "\"formats\"", "field format is missing")]
    public void A_damaged_manifest_is_refused_with_the_fix(string from, string to, string message)
    {
        var text = ScorerCompiler.Build(GoldenFileTests.SmallLateral(), "plant.json", new CompileOptions(["c"], NumericMode.F32, "plant")).ManifestFile.Text;
        var damaged = new Regex(Regex.Escape(from)).Replace(text, to, 1);
        Assert.NotEqual(text, damaged);
        var e = Assert.Throws<EmitException>(() => SourceManifestJson.Read(damaged, "plant.emit.json"));
        Assert.Contains(message, e.Message);
        Assert.Contains("regenerate the sources", e.Hint);
        Assert.Equal("plant.emit.json", e.File);
    }

    [Fact]
    public void Custom_templates_are_recorded_with_their_origin_and_hash()
    {
        var templates = Toolchain.TempDir("manifest-templates");
        Directory.CreateDirectory(Path.Combine(templates, "c"));
        var custom = Path.Combine(templates, "c", CEmitter.HeaderTemplate);
        File.WriteAllText(custom, "/* custom header for {{ d.UName }} */\n");
        var gen = CompileTo("manifest-custom", "--target", "c", "--templates", templates);
        var text = File.ReadAllText(Path.Combine(gen, "plant.emit.json"));
        AssertValid(text);
        Assert.DoesNotContain(templates, text);                        // no paths
        var m = SourceManifestJson.Read(text, "plant.emit.json");
        Assert.True(m.CustomTemplates);
        var header = Assert.Single(m.Templates, t => t.File == CEmitter.HeaderTemplate);
        Assert.True(header.Custom);
        Assert.StartsWith(header.Sha256 + "  ", Toolchain.RunOk(Toolchain.Require("sha256sum"), [custom]));
        Assert.All(m.Templates.Where(t => t.File != CEmitter.HeaderTemplate), t => Assert.False(t.Custom));
    }
}
