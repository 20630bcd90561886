using Emit.Tests.Cli;

namespace Emit.Tests.Project;

/// <summary><c>emit build</c>: the same files as <c>emit compile</c> with the same options, and nothing written on failure.</summary>
public sealed class ProjectBuildTests
{
    private static string Project(string dir, string scorers)
    {
        var path = Path.Combine(dir, "plant.emitproject.json");
        File.WriteAllText(path, "{\"format\": \"emit.project\", \"version\": 1, \"scorers\": [\n" + scorers + "\n]}\n");
        return path;
    }

    private static Dictionary<string, string> Tree(string dir) =>
        Directory.Exists(dir)
            ? Directory.GetFiles(dir, "*", SearchOption.AllDirectories).Where(f => Path.GetFileName(f) != WrittenLedger.FileName).ToDictionary(f => Path.GetRelativePath(dir, f), File.ReadAllText)
            : [];

    [Fact]
    public void Build_writes_what_compile_writes_for_each_entry()
    {
        var dir = ProjectFileTests.FolderWithModel();
        var project = Project(dir, """
            {"model": "m.json", "targets": ["c", "csharp"], "numeric": "f64", "name": "plant", "namespace": "Plant.Monitoring", "out": "gen/f64"},
            {"model": "m.json", "numeric": "fixed", "weights": "int8", "softplus_table": 512, "selftest_vectors": 5, "out": "gen/q"}
            """);
        var built = CliRunner.Run("build", project);
        Assert.True(built.ExitCode == 0, built.Error);
        var model = Path.Combine(dir, "m.json");
        var a = CliRunner.Run("compile", model, "--target", "c,csharp", "--numeric", "f64", "--name", "plant", "--namespace", "Plant.Monitoring", "--out", Path.Combine(dir, "cmp", "f64"));
        var b = CliRunner.Run("compile", model, "--numeric", "fixed", "--weights", "int8", "--softplus-table", "512", "--selftest-vectors", "5", "--out", Path.Combine(dir, "cmp", "q"));
        Assert.True(a.ExitCode == 0 && b.ExitCode == 0, a.Error + b.Error);
        var expected = Tree(Path.Combine(dir, "cmp"));
        var actual = Tree(Path.Combine(dir, "gen"));
        // each scorer's manifest beside its sources (docs/manifest.md), the same bytes as compile writes
        Assert.Equal(["f64/plant.c", "f64/plant.cs", "f64/plant.emit.json", "f64/plant.h", "q/m.c", "q/m.emit.json", "q/m.h"], actual.Keys.Order());
        Assert.Equal(expected, actual);
        Assert.Equal(7, built.Out.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length);
    }

    /// <summary>
    /// A scorer with the alarm filter and explanations and a classifier over two models: the same files as compile
    /// writes with the same options, the classifier's manifest included.
    /// </summary>
    [Fact]
    public void Build_writes_what_compile_writes_for_firmware_features_and_a_classifier()
    {
        var dir = ProjectFileTests.FolderWithModel();
        foreach (var (file, seed) in new[] { ("idle.json", 5), ("defrost.json", 6) })
        {
            var m = Emit.Tests.TestModels.Random(Emit.Model.ModelKind.Rbm, 8, 3, seed);
            Emit.Model.ModelJson.WriteFile(
                m.With(null, new Emit.Model.LogPartition(Emit.Tests.Reference.BruteForce.LogPartition(m), "exact", 0)),
                Path.Combine(dir, file), force: true);
        }
        var project = Project(dir, """
            {"model": "m.json", "name": "plant", "numeric": "fixed", "alarm_filter": "3/5", "explain": true, "out": "gen/plant"},
            {"models": ["idle.json", "defrost.json"], "priors": [0.8, 0.2], "name": "modes", "targets": ["c", "csharp"], "out": "gen/modes"}
            """);
        var built = CliRunner.Run("build", project);
        Assert.True(built.ExitCode == 0, built.Error);
        var a = CliRunner.Run("compile", Path.Combine(dir, "m.json"), "--name", "plant", "--numeric", "fixed",
            "--alarm-filter", "3/5", "--explain", "--out", Path.Combine(dir, "cmp", "plant"));
        var b = CliRunner.Run("compile", Path.Combine(dir, "idle.json"), Path.Combine(dir, "defrost.json"),
            "--priors", "0.8,0.2", "--name", "modes", "--target", "c,csharp", "--out", Path.Combine(dir, "cmp", "modes"));
        Assert.True(a.ExitCode == 0 && b.ExitCode == 0, a.Error + b.Error);
        var actual = Tree(Path.Combine(dir, "gen"));
        Assert.Equal(Tree(Path.Combine(dir, "cmp")), actual);
        Assert.Contains("modes/modes.emit.json", actual.Keys);
        Assert.Contains("modes/modes_2.cs", actual.Keys);
        Assert.Contains("#define PLANT_FILTER_N 5", actual["plant/plant.h"]);
        Assert.Contains("plant_explain(", actual["plant/plant.h"]);
    }

    [Fact]
    public void A_failing_entry_leaves_every_output_folder_as_it_was()
    {
        var dir = ProjectFileTests.FolderWithModel();
        File.WriteAllText(Path.Combine(dir, "broken.json"), "{\"format\": \"emit.model\", \"version\": 1, \"kind\": \"rbm\"}");
        var project = Project(dir, """
            {"model": "m.json", "out": "gen/a"},
            {"model": "broken.json", "out": "gen/b"}
            """);
        var r = CliRunner.Run("build", project);
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("broken.json", r.Error);
        Assert.Single(r.Error.Trim().Split('\n'));
        Assert.False(Directory.Exists(Path.Combine(dir, "gen")));
    }

    [Fact]
    public void A_hand_written_file_in_any_folder_stops_the_whole_build_unless_forced()
    {
        var dir = ProjectFileTests.FolderWithModel();
        var project = Project(dir, """
            {"model": "m.json", "out": "gen/a"},
            {"model": "m.json", "name": "second", "out": "gen/b"}
            """);
        Directory.CreateDirectory(Path.Combine(dir, "gen", "b"));
        File.WriteAllText(Path.Combine(dir, "gen", "b", "second.h"), "/* ours */\n");
        var r = CliRunner.Run("build", project);
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("would replace a file that emit did not write", r.Error);
        Assert.False(Directory.Exists(Path.Combine(dir, "gen", "a")));
        Assert.Equal("/* ours */\n", File.ReadAllText(Path.Combine(dir, "gen", "b", "second.h")));

        var forced = CliRunner.Run("build", project, "--force");
        Assert.True(forced.ExitCode == 0, forced.Error);
        Assert.Contains("generated by emit", File.ReadAllText(Path.Combine(dir, "gen", "b", "second.h")));
        Assert.True(File.Exists(Path.Combine(dir, "gen", "a", "m.c")));
    }

    [Fact]
    public void A_bad_project_is_one_line_and_exit_2()
    {
        var dir = ProjectFileTests.FolderWithModel();
        var project = Project(dir, "{\"model\": \"m.json\", \"weights\": \"int8\"}"); // "weights" starts in column 21 of line 2
        var r = CliRunner.Run("build", project);
        Assert.Equal(2, r.ExitCode);
        Assert.Equal("", r.Out);
        Assert.Matches(@"^emit: error: .*plant\.emitproject\.json:2:21: scorers\[0\]\.weights applies to numeric fixed only \(.*\)\n$", r.Error);
        Assert.Equal(2, CliRunner.Run("build").ExitCode);                                  // missing argument
        Assert.Equal(2, CliRunner.Run("build", Path.Combine(dir, "nope.json")).ExitCode);   // no such file
    }
}
