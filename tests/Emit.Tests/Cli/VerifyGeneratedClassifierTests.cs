using System.Text.Json;
using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Model;
using Emit.Tests.Emission;
using Emit.Tests.Harness;
using Emit.Tests.Reference;

namespace Emit.Tests.Cli;

/// <summary>
/// A generated classifier (<c>compile M1 M2 ... --name NAME</c>) writes its own manifest <c>NAME.emit.json</c> beside
/// the models' scorers (docs/manifest.md, "Classifier manifest"), and <c>verify M1 M2 ... --generated DIR</c> checks
/// the folder as it checks one scorer's: every file exactly what emit generates from the models with the recorded
/// options, then the classifier's indices and scores against the reference on every target. The manifest is held
/// against its JSON Schema (JsonSchema.Net) and its hashes against sha256sum (GNU coreutils); the reference scores
/// against log Z from enumeration (<see cref="BruteForce"/>).
/// </summary>
public sealed class VerifyGeneratedClassifierTests
{
    private const int Visible = 8;

    private static BoltzmannModel Model(int seed, double scale = 1.0)
    {
        var m = TestModels.Random(ModelKind.Rbm, Visible, 4, seed, scale: scale);
        return m.With(null, new LogPartition(BruteForce.LogPartition(m), "exact", 0));
    }

    /// <summary>Three models, every input as vectors, and the classifier compiled with the options into gen/.</summary>
    private static (string Dir, string[] Models, string Vectors, string Gen) Compiled(string what,
        params string[] options)
    {
        var dir = Toolchain.TempDir(what);
        var models = new[] { "idle.json", "defrost.json", "fault.json" }.Select((f, k) =>
        {
            var path = Path.Combine(dir, f);
            ModelJson.WriteFile(Model(31 + k), path, force: true);
            return path;
        }).ToArray();
        var vectors = VerifyCases.WriteVectors(dir,
            Enumerable.Range(0, 1 << Visible).Select(v => TestModels.Bits(v, Visible)));
        var gen = Path.Combine(dir, "gen");
        var r = CliRunner.Run(["compile", .. models, "--name", "modes", "--priors", "0.6,0.3,0.1", "--out", gen,
            .. options]);
        Assert.True(r.ExitCode == 0, r.Error);
        return (dir, models, vectors, gen);
    }

    private static void OneLineError(CliRunner.Result r, string message)
    {
        Assert.True(r.ExitCode == 2, $"exit {r.ExitCode}: {r.Out}{r.Error}");
        Assert.Contains(message, r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
    }

    [Theory]
    [InlineData("f32")]
    [InlineData("fixed")]
    public void The_classifier_manifest_matches_its_schema_and_records_models_priors_and_every_file(string numeric)
    {
        var (_, models, _, gen) = Compiled("classifier-manifest", "--target", "c,csharp", "--numeric", numeric);
        var path = Path.Combine(gen, "modes.emit.json");
        var text = File.ReadAllText(path);
        SourceManifestTests.AssertValid(text);
        var m = ClassifierManifestJson.Read(text, path);
        Assert.Equal("modes", m.Name);
        Assert.Equal([0.6, 0.3, 0.1], m.Priors!);
        Assert.Equal(3, m.Models.Count);
        var sums = Toolchain.RunOk(Toolchain.Require("sha256sum"),
            [.. m.Files.Select(f => f.File), .. m.Models.Select(x => x.Manifest)], workDir: gen);
        for (int k = 0; k < 3; k++)
        {
            var x = m.Models[k];
            Assert.Equal(Path.GetFileName(models[k]), x.File);
            Assert.Equal(ModelJson.Read(models[k]).Sha256, x.Sha256);
            Assert.Equal($"modes_{k + 1}", x.Scorer);
            Assert.Contains($"{x.ManifestSha256}  {x.Manifest}\n", sums);
            Assert.Equal(Math.Log(new[] { 0.6, 0.3, 0.1 }[k]), x.LogPrior, 12);
        }
        // the classifier's own files, and nothing else the manifest does not cover
        Assert.Equal(["modes.c", "modes.cs", "modes.h"], m.Files.Select(f => f.File).Order(StringComparer.Ordinal));
        foreach (var f in m.Files) Assert.Contains($"{f.Sha256}  {f.File}\n", sums);
        Assert.Equal(text, ClassifierManifestJson.Write(m));
        // a scorer manifest reader refuses it with the fix, naming what it is
        var e = Assert.Throws<EmitException>(() => SourceManifestJson.Read(text, path));
        Assert.Contains("a classifier over 3 models", e.Message);
    }

    [Theory]
    [InlineData("\"scorer\": \"modes_2\"", "\"scorer\": \"modes_9\"", "do not go together")]
    [InlineData("\"log_z\"", "\"log_zz\"", "field classifier.models[0].log_z is missing")]
    [InlineData("\"score_bound\": ", "\"score_bound\": \"", "not valid JSON")]
    [InlineData("\"energy_scale\"", "\"energy_scalex\"", "field classifier.energy_scale is missing")]
    [InlineData("\"format\": \"emit.manifest\"", "\"format\": \"emit.project\"", "not an emit manifest")]
    public void A_damaged_classifier_manifest_is_refused_naming_the_field(string from, string to, string message)
    {
        var compiled = ClassifierCompiler.Build([Model(1), Model(2), Model(3)], ["a.json", "b.json", "c.json"],
            [1, 2, 3], new CompileOptions(["c"], Emit.Quantize.NumericMode.F32, "modes"));
        var text = compiled.ManifestFile.Text;
        var damaged = new Regex(Regex.Escape(from)).Replace(text, to, 1);
        Assert.NotEqual(text, damaged);
        var e = Assert.Throws<EmitException>(() => ClassifierManifestJson.Read(damaged, "modes.emit.json"));
        Assert.Contains(message, e.Message);
        Assert.Equal("modes.emit.json", e.File);
        // what was written reads back as written
        Assert.Equal(compiled.ManifestFile.Text,
            ClassifierManifestJson.Write(ClassifierManifestJson.Read(compiled.ManifestFile.Text, "modes.emit.json")));
    }

    [SkippableTheory]
    [InlineData("f32")]
    [InlineData("fixed")]
    public void Verify_generated_checks_the_classifier_folder_on_every_target(string numeric)
    {
        VerifyCases.Require("c", "csharp", "cortex-m3");
        var (dir, models, vectors, gen) = Compiled("classifier-verify-gen", "--target", "c,csharp",
            "--numeric", numeric);
        var json = Path.Combine(dir, "r.json");
        var r = CliRunner.Run(["verify", .. models, "--input", vectors, "--generated", gen, "--target",
            "c,csharp,cortex-m3", "--report", json]);
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        // the report names every model in class order, and says what the table's rows are
        var report = VerifyCommandTests.ReadReport(json);
        var named = report.GetProperty("classifier_models").EnumerateArray()
            .Select(m => (m.GetProperty("model").GetString()!, m.GetProperty("model_sha256").GetString()!)).ToArray();
        Assert.Equal(models.Select(m => (Path.GetFileName(m), ModelLoader.Load(m).Sha256)).ToArray(), named);
        Assert.StartsWith("emit verify: classifier over 3 models idle.json (sha256 ", r.Out);
        Assert.Contains("the table is idle.json's scorer", r.Out);
        foreach (var t in report.GetProperty("targets").EnumerateArray())
        {
            Assert.True(t.GetProperty("sources_match").GetBoolean());
            var f = Assert.Single(t.GetProperty("features").EnumerateArray());
            Assert.Equal("classify", f.GetProperty("feature").GetString());
            Assert.Equal(1 << Visible, f.GetProperty("checks").GetInt64());
            Assert.Equal(0, f.GetProperty("mismatches").GetInt64());
        }
    }

    /// <summary>
    /// A hand edit of the classifier's own file (an offset constant nudged) fails the target naming the file and
    /// line, as an edited scorer file does; so does an edited scorer of one model and an edited model manifest.
    /// </summary>
    [SkippableFact]
    public void An_edited_classifier_file_fails_naming_the_file_and_line()
    {
        VerifyCases.Require("c");
        var (_, models, vectors, gen) = Compiled("classifier-verify-edit", "--target", "c", "--numeric", "fixed");
        foreach (var file in new[] { "modes.c", "modes_2.c", "modes_3.emit.json" })
        {
            var path = Path.Combine(gen, file);
            var text = File.ReadAllText(path);
            var edited = Regex.Replace(text, @"(\d)(\D*)$", m => (m.Groups[1].Value == "7" ? "6" : "7") +
                m.Groups[2].Value, RegexOptions.Singleline);
            int at = Regex.Match(text, @"(\d)(\D*)$", RegexOptions.Singleline).Index;
            int line = text[..at].Count(c => c == '\n') + 1;
            File.WriteAllText(path, edited);
            var r = CliRunner.Run(["verify", .. models, "--input", vectors, "--generated", gen, "--target", "c"]);
            Assert.True(r.ExitCode == 1, file + ": " + r.Out + r.Error);
            Assert.Contains($"{file}: edited after generation; first difference at line {line}", r.Out);
            File.WriteAllText(path, text);
        }
        Assert.Equal(0, CliRunner.Run(["verify", .. models, "--input", vectors, "--generated", gen, "--target", "c"])
            .ExitCode);
    }

    [Fact]
    public void Models_that_are_not_the_manifests_are_one_line_errors()
    {
        var (dir, models, vectors, gen) = Compiled("classifier-verify-models", "--target", "c");
        string[] Verify(params string[] more) =>
            ["verify", .. more, "--input", vectors, "--generated", gen, "--target", "c"];
        // a model the manifest names is not given
        OneLineError(CliRunner.Run(Verify(models[0], models[1])), "fault.json");
        var other = Path.Combine(dir, "other.json");
        ModelJson.WriteFile(Model(77), other, force: true);
        OneLineError(CliRunner.Run(Verify(models[0], models[1], other)), "fault.json");
        // the models in another order: class k would be another model
        OneLineError(CliRunner.Run(Verify(models[1], models[0], models[2])), "in the manifest's order");
        // a model whose content changed since the classifier was generated
        ModelJson.WriteFile(Model(33, scale: 1.5), models[2], force: true);
        OneLineError(CliRunner.Run(Verify(models)), "fault.json has sha256");
    }

    [Fact]
    public void A_name_that_is_not_the_classifier_is_a_one_line_error()
    {
        var (_, models, vectors, gen) = Compiled("classifier-verify-name", "--target", "c");
        string[] Verify(string[] given, params string[] more) =>
            ["verify", .. given, "--input", vectors, "--generated", gen, "--target", "c", .. more];
        OneLineError(CliRunner.Run(Verify(models, "--name", "pumps")), "no classifier pumps");
        OneLineError(CliRunner.Run(Verify(models, "--name", "modes_1")), "modes_1 is a scorer");
        // one model against the classifier's own manifest, or the folder without a name: say how to check it
        OneLineError(CliRunner.Run(Verify([models[0]], "--name", "modes")), "a classifier over 3 models");
        OneLineError(CliRunner.Run(Verify([models[0]])), "modes is a classifier over 3 models");
        // a manifest whose name field is not its file's
        var path = Path.Combine(gen, "modes.emit.json");
        File.WriteAllText(path, File.ReadAllText(path).Replace("\"name\": \"modes\"", "\"name\": \"other\"",
            StringComparison.Ordinal));
        OneLineError(CliRunner.Run(Verify(models)), "describes classifier \"other\", not \"modes\"");
    }

    [Fact]
    public void A_classifier_manifest_damaged_into_invalid_json_is_reported_as_such()
    {
        var (_, models, vectors, gen) = Compiled("classifier-verify-damaged", "--target", "c");
        var path = Path.Combine(gen, "modes.emit.json");
        File.AppendAllText(path, "\u0001\u0002");
        var r = CliRunner.Run(["verify", .. models, "--input", vectors, "--generated", gen, "--target", "c",
            "--name", "modes"]);
        OneLineError(r, "not valid JSON");
        Assert.Contains("modes.emit.json", r.Error);
    }
}
