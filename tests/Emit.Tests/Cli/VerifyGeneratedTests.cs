using System.Globalization;
using System.Text.Json;
using System.Text.RegularExpressions;
using Emit.Emission;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;
using Emit.Tests.Emission;
using Emit.Tests.Harness;

namespace Emit.Tests.Cli;

/// <summary>
/// <c>emit verify --generated</c> checks existing sources strictly against their manifest (docs/verify-report.md,
/// "Existing sources"): a hand edit too small for the numbers to show fails, sources without a manifest are refused
/// with the fix, and <c>--fail-on-decision-mismatch</c> fails on any differing decision.
/// </summary>
public sealed class VerifyGeneratedTests
{
    private static readonly CodegenCases.Case Lateral = CodegenCases.All.Single(x => x.Id == "lat_a");

    private static (string Dir, string Model, string Vectors, string Gen) Compiled(string what, params string[] options)
    {
        var dir = Toolchain.TempDir(what);
        var model = Path.Combine(dir, "plant.json");
        ModelJson.WriteFile(Lateral.Model, model, force: true);
        var vectors = VerifyCases.WriteVectors(dir, TestVectorSet.Generate(Lateral.Model, new TestVectorOptions(30, Seed: 3)).Select(v => v.Units));
        var gen = Path.Combine(dir, "gen");
        var r = CliRunner.Run(["compile", model, "--out", gen, .. options]);
        Assert.True(r.ExitCode == 0, r.Error);
        return (dir, model, vectors, gen);
    }

    private static JsonElement Target(string json, string name) =>
        JsonDocument.Parse(File.ReadAllText(json)).RootElement.GetProperty("targets").EnumerateArray().Single(t => t.GetProperty("target").GetString() == name);

    /// <summary>
    /// Regression: the first f32 weight constant of the generated C is changed in its last digits, by far less than
    /// the error bound. The numbers still agree within the bound, so only the comparison with freshly generated
    /// sources can catch it: exit 1, naming the file and the first differing line.
    /// </summary>
    [SkippableFact]
    public void An_f32_weight_edited_by_less_than_the_error_bound_fails_naming_the_file_and_line()
    {
        VerifyCases.Require("c");
        var (dir, model, vectors, gen) = Compiled("verify-small-edit", "--target", "c", "--numeric", "f32");
        var path = Path.Combine(gen, "plant.c");
        var text = File.ReadAllText(path);
        int table = text.IndexOf("plant_weights[", StringComparison.Ordinal);
        var literal = Regex.Match(text[table..], @"\n\s+(-?[0-9.e+-]+)f,");
        float original = float.Parse(literal.Groups[1].Value, CultureInfo.InvariantCulture);
        float changed = MathF.BitIncrement(original);                         // the next binary32 value up
        var changedText = changed.ToString("R", CultureInfo.InvariantCulture);
        int at = table + literal.Groups[1].Index;
        var edited = text[..at] + changedText + text[(at + literal.Groups[1].Length)..];
        File.WriteAllText(path, edited);
        int line = edited[..at].Count(c => c == '\n') + 1;
        var bound = SourceManifestJson.ReadFile(Path.Combine(gen, "plant.emit.json")).ErrorBound;
        Assert.True(Math.Abs((double)changed - original) < bound / 1000, "the edit is far smaller than the bound");

        var json = Path.Combine(dir, "r.json");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c", "--report", json);
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        Assert.Contains($"FAIL c: plant.c: edited after generation; first difference at line {line}", r.Out);
        Assert.Contains(changedText + "f", r.Out);
        var t = Target(json, "c");
        Assert.False(t.GetProperty("passed").GetBoolean());
        Assert.False(t.GetProperty("sources_match").GetBoolean());
        var edit = Assert.Single(t.GetProperty("edits").EnumerateArray());
        Assert.Equal("plant.c", edit.GetProperty("file").GetString());
        Assert.Equal(line, edit.GetProperty("line").GetInt32());
        Assert.Contains(literal.Groups[1].Value + "f", edit.GetProperty("expected").GetString());
        Assert.Contains(changedText + "f", edit.GetProperty("found").GetString());
        Assert.False(edit.GetProperty("matches_manifest").GetBoolean());
        // what makes the check necessary: the numbers alone stay within the bound
        Assert.True(t.GetProperty("max_abs_error").GetDouble() <= t.GetProperty("error_bound").GetDouble());
        Assert.Single(t.GetProperty("failures").EnumerateArray());

        // the untouched sources pass
        File.WriteAllText(path, text);
        var good = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c", "--report", json);
        Assert.True(good.ExitCode == 0, good.Out + good.Error);
        Assert.True(Target(json, "c").GetProperty("sources_match").GetBoolean());
    }

    /// <summary>
    /// Sources from another version of the model (one weight differs): exit 1 naming both hashes, nothing run.
    /// </summary>
    /// <summary>Regression: the manifest did not record <c>--optimize</c>, so sources compiled for size were
    /// regenerated for speed and reported as edited after generation.</summary>
    [SkippableFact]
    public void Sources_compiled_for_size_verify_as_generated()
    {
        var (_, model, vectors, gen) = Compiled("verify-size", "--target", "c", "--numeric", "fixed", "--optimize", "size");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c");
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
    }

    [SkippableFact]
    public void Sources_generated_from_another_model_version_fail_with_both_hashes()
    {
        VerifyCases.Require("c");
        var (dir, model, vectors, gen) = Compiled("verify-model-version", "--target", "c", "--numeric", "f64");
        var m = Lateral.Model;
        var weights = m.Weights.ToArray();
        weights[0] += 1e-9;
        var newer = new BoltzmannModel(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, [.. weights], m.VisibleLinks, m.HiddenLinks);
        var newerPath = Path.Combine(dir, "plant-v2.json");
        ModelJson.WriteFile(newer, newerPath, force: true);
        var r = CliRunner.Run("verify", newerPath, "--input", vectors, "--generated", gen, "--name", "plant");
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        Assert.Contains($"generated from model sha256 {m.Sha256} (plant.json), but plant-v2.json has sha256 {newer.Sha256}", r.Out);
        Assert.Contains("--allow-model-change", r.Out);
    }

    [SkippableFact]
    public void Sources_without_a_manifest_are_refused_with_the_fix()
    {
        var (_, model, vectors, gen) = Compiled("verify-no-manifest", "--target", "c");
        File.Delete(Path.Combine(gen, "plant.emit.json"));
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--cc", Toolchain.Require("cc"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("no manifest NAME.emit.json beside the sources", r.Error);
        Assert.Contains("regenerate them with this version: emit compile MODEL --target c", r.Error);
        var named = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--name", "plant", "--cc", Toolchain.Require("cc"));
        Assert.Equal(2, named.ExitCode);
        Assert.Contains("no manifest plant.emit.json beside the sources", named.Error);
    }

    /// <summary>
    /// A file that still has the manifest's hash but is not what this emit generates (as after an upgrade of emit
    /// or of the templates) fails with "regenerate", not as an edit.
    /// </summary>
    [SkippableFact]
    public void Sources_emit_no_longer_generates_fail_asking_to_regenerate()
    {
        VerifyCases.Require("c");
        var (dir, model, vectors, gen) = Compiled("verify-older-emit", "--target", "c", "--numeric", "f32");
        var path = Path.Combine(gen, "plant.h");
        var text = File.ReadAllText(path);
        var older = text.Replace("do not edit", "do not edit (older layout)", StringComparison.Ordinal);
        Assert.NotEqual(text, older);
        File.WriteAllText(path, older);
        // as an older emit would have recorded it: the manifest holds the file's current hash
        var manifestPath = Path.Combine(gen, "plant.emit.json");
        var manifest = File.ReadAllText(manifestPath);
        var oldHash = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(text)));
        var newHash = Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(System.Text.Encoding.UTF8.GetBytes(older)));
        Assert.Contains(oldHash, manifest);
        File.WriteAllText(manifestPath, manifest.Replace(oldHash, newHash, StringComparison.Ordinal));

        var json = Path.Combine(dir, "r.json");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--target", "c", "--report", json);
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        Assert.Contains("FAIL c: plant.h: not what emit", r.Out);
        Assert.Contains("regenerate the sources", r.Out);
        var edit = Assert.Single(Target(json, "c").GetProperty("edits").EnumerateArray());
        Assert.Equal(text.Split('\n').ToList().FindIndex(l => l.Contains("do not edit", StringComparison.Ordinal)) + 1, edit.GetProperty("line").GetInt32());
        Assert.True(edit.GetProperty("matches_manifest").GetBoolean());
    }

    [SkippableFact]
    public void Sources_made_with_custom_templates_need_the_same_templates_folder()
    {
        VerifyCases.Require("c");
        var templates = Toolchain.TempDir("verify-templates");
        Directory.CreateDirectory(Path.Combine(templates, "c"));
        var root = AppContext.BaseDirectory;
        while (!Directory.Exists(Path.Combine(root, "templates", "c"))) root = Path.GetDirectoryName(root)!;
        var shipped = File.ReadAllText(Path.Combine(root, "templates", "c", CEmitter.HeaderTemplate));
        File.WriteAllText(Path.Combine(templates, "c", CEmitter.HeaderTemplate), "/* site licence line */\n" + shipped);
        var (_, model, vectors, gen) = Compiled("verify-custom", "--target", "c", "--templates", templates);
        Assert.StartsWith("/* site licence line */", File.ReadAllText(Path.Combine(gen, "plant.h")));

        var missing = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen);
        Assert.Equal(2, missing.ExitCode);
        Assert.Contains("were generated with custom templates (c/" + CEmitter.HeaderTemplate + ")", missing.Error);
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--templates", templates);
        Assert.True(r.ExitCode == 0, r.Out + r.Error);
        var shippedOnly = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--templates", Toolchain.TempDir("verify-no-templates"));
        Assert.Equal(1, shippedOnly.ExitCode);
        Assert.Contains("plant.h: not what emit", shippedOnly.Out);
    }

    /// <summary>
    /// A decision that differs from the reference within the bound is explained, and passes; with
    /// --fail-on-decision-mismatch it fails. The threshold is put between the reference free energy of one input and
    /// the fixed-point result for it (from the library's bit-exact simulator, which the C target matches bit for bit).
    /// </summary>
    [SkippableFact]
    public void Fail_on_decision_mismatch_fails_a_difference_the_bound_explains()
    {
        VerifyCases.Require("c");
        var m0 = Lateral.Model;
        var reference = new ReferenceScorer(m0);
        var options = new FixedPointOptions();
        var plan = FixedPointPlanner.Build(m0, options);
        var sim = new FixedPointSimulator(plan);
        byte[]? chosen = null;
        double fr = 0, fg = 0;
        foreach (var v in TestVectorSet.Generate(m0, new TestVectorOptions(30, Seed: 3)).Select(v => v.Units))
        {
            fr = reference.FreeEnergy(v);
            fg = sim.FreeEnergy(v) / plan.EnergyScale;
            if (Math.Abs(fr - fg) > 1e-9) { chosen = v; break; }
        }
        Assert.NotNull(chosen);
        double t = (fr + fg) / 2;
        var model = m0.With(t, m0.LogPartition);
        Assert.Equal(fg, new FixedPointSimulator(FixedPointPlanner.Build(model, options)).FreeEnergy(chosen) / plan.EnergyScale);

        var dir = Toolchain.TempDir("verify-decision");
        var path = Path.Combine(dir, "plant.json");
        ModelJson.WriteFile(model, path, force: true);
        var vectors = VerifyCases.WriteVectors(dir, [chosen!]);
        var json = Path.Combine(dir, "r.json");
        var lenient = CliRunner.Run("verify", path, "--input", vectors, "--numeric", "fixed", "--target", "c", "--report", json);
        Assert.True(lenient.ExitCode == 0, lenient.Out + lenient.Error);
        Assert.Equal(1, Target(json, "c").GetProperty("decision_mismatches").GetInt64());
        Assert.Equal(0, Target(json, "c").GetProperty("unexplained_mismatches").GetInt64());

        var strict = CliRunner.Run("verify", path, "--input", vectors, "--numeric", "fixed", "--target", "c", "--fail-on-decision-mismatch", "--report", json);
        Assert.True(strict.ExitCode == 1, strict.Out + strict.Error);
        Assert.Contains("FAIL c: 1 of 1 decisions differ from the reference", strict.Out);
        Assert.True(JsonDocument.Parse(File.ReadAllText(json)).RootElement.GetProperty("fail_on_decision_mismatch").GetBoolean());
    }

    [SkippableFact]
    public void Line_ends_changed_by_a_checkout_are_named_as_such()
    {
        VerifyCases.Require("c");
        var (_, model, vectors, gen) = Compiled("verify-crlf", "--target", "c");
        var path = Path.Combine(gen, "plant.h");
        File.WriteAllText(path, File.ReadAllText(path).Replace("\n", "\r\n", StringComparison.Ordinal));
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen);
        Assert.True(r.ExitCode == 1, r.Out + r.Error);
        Assert.Contains("FAIL c: plant.h: line ends changed to CRLF after generation", r.Out);
    }

    [Theory]
    [InlineData("--allow-model-change")]
    [InlineData("--templates")]
    public void Options_for_existing_sources_without_generated_are_exit_2(string option)
    {
        var (dir, model, vectors, _) = Compiled("verify-no-generated", "--target", "c");
        string[] args = option == "--templates" ? [option, dir] : [option];
        var r = CliRunner.Run(["verify", model, "--input", vectors, .. args]);
        Assert.Equal(2, r.ExitCode);
        Assert.Contains($"{option} applies to existing sources only", r.Error);
    }

    [SkippableFact]
    public void Fixed_point_options_contradicting_the_manifest_are_exit_2()
    {
        var (_, model, vectors, gen) = Compiled("verify-fixed-options", "--target", "c", "--numeric", "fixed", "--weights", "int8");
        var r = CliRunner.Run("verify", model, "--input", vectors, "--generated", gen, "--weights", "int16", "--cc", Toolchain.Require("cc"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("plant.c was generated with other fixed-point options (--weights int8 --accumulator auto --softplus-table 256), not --weights int16", r.Error);
    }
}
