using System.Security.Cryptography;
using Emit.Tests.Cli;

namespace Emit.Tests.Project;

/// <summary>
/// <c>emit build</c> with outputs that are the same file under two spellings (a link to a folder, <c>..</c>, case):
/// the build is refused before anything is written, and a failing build leaves every file as it was.
/// </summary>
public sealed class ProjectBuildCollisionTests
{
    private static string Project(string dir, string scorers)
    {
        var path = Path.Combine(dir, "plant.emitproject.json");
        File.WriteAllText(path, "{\"format\": \"emit.project\", \"version\": 1, \"scorers\": [\n" + scorers + "\n]}\n");
        return path;
    }

    /// <summary>Every file under <paramref name="dir"/> (links not followed) with its SHA-256 and modification time.</summary>
    private static Dictionary<string, (string Hash, DateTime Written)> Snapshot(string dir) =>
        Directory.GetFiles(dir, "*", new EnumerationOptions { RecurseSubdirectories = true, AttributesToSkip = FileAttributes.ReparsePoint })
            .ToDictionary(f => Path.GetRelativePath(dir, f), f => (Convert.ToHexString(SHA256.HashData(File.ReadAllBytes(f))), File.GetLastWriteTimeUtc(f)));

    private static void AssertUnchanged(Dictionary<string, (string Hash, DateTime Written)> before, string dir)
    {
        var after = Snapshot(dir);
        Assert.Equal(before.Keys.Order(), after.Keys.Order());
        foreach (var (k, v) in before) Assert.True(after[k] == v, $"{k} was rewritten by a failing build");
    }

    [Fact]
    public void Two_scorer_folders_that_are_one_folder_through_a_link_are_refused_and_nothing_changes()
    {
        var dir = ProjectFileTests.FolderWithModel();
        // A first, successful build fills gen/a; the second names gen/a twice (once through the link).
        Assert.Equal(0, CliRunner.Run("build", Project(dir, """{"model": "m.json", "name": "s", "out": "gen/a"}""")).ExitCode);
        Directory.CreateSymbolicLink(Path.Combine(dir, "alias"), Path.Combine(dir, "gen", "a"));
        var project = Project(dir, """
            {"model": "m.json", "name": "s", "numeric": "f64", "out": "gen/a"},
            {"model": "m.json", "name": "s", "numeric": "fixed", "out": "alias"}
            """);
        var before = Snapshot(dir);
        var r = CliRunner.Run("build", project);
        Assert.Equal(2, r.ExitCode);
        Assert.Single(r.Error.Trim().Split('\n'));
        AssertUnchanged(before, dir);
    }

    [Theory]
    [InlineData("gen/x/../a")]
    [InlineData("gen/a/")]
    [InlineData("gen//a")]
    public void The_same_folder_spelled_differently_is_refused(string other)
    {
        var dir = ProjectFileTests.FolderWithModel();
        Directory.CreateDirectory(Path.Combine(dir, "gen", "x"));
        var project = Project(dir, $$"""
            {"model": "m.json", "name": "s", "out": "gen/a"},
            {"model": "m.json", "name": "s", "numeric": "f64", "out": "{{other}}"}
            """);
        var before = Snapshot(dir);
        var r = CliRunner.Run("build", project);
        Assert.Equal(2, r.ExitCode);
        AssertUnchanged(before, dir);
        Assert.False(Directory.Exists(Path.Combine(dir, "gen", "a")) && Directory.EnumerateFiles(Path.Combine(dir, "gen", "a")).Any());
    }

    [Fact]
    public void Scorer_names_that_differ_only_in_case_are_refused_in_one_folder()
    {
        // reefer.h and REEFER.h are one file on case-insensitive file systems (NTFS, APFS by default), and both
        // would define the guard EMIT_GENERATED_REEFER_H and the macros REEFER_*.
        var dir = ProjectFileTests.FolderWithModel();
        var project = Project(dir, """
            {"model": "m.json", "name": "reefer", "out": "gen"},
            {"model": "m.json", "name": "REEFER", "out": "gen"}
            """);
        var before = Snapshot(dir);
        var r = CliRunner.Run("build", project);
        Assert.Equal(2, r.ExitCode);
        Assert.Single(r.Error.Trim().Split('\n'));
        AssertUnchanged(before, dir);
    }

    [Fact]
    public void Distinct_names_through_a_link_still_build()
    {
        var dir = ProjectFileTests.FolderWithModel();
        Directory.CreateDirectory(Path.Combine(dir, "gen"));
        Directory.CreateSymbolicLink(Path.Combine(dir, "alias"), Path.Combine(dir, "gen"));
        var r = CliRunner.Run("build", Project(dir, """
            {"model": "m.json", "name": "one", "out": "gen"},
            {"model": "m.json", "name": "two", "out": "alias"}
            """));
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.True(File.Exists(Path.Combine(dir, "gen", "one.c")) && File.Exists(Path.Combine(dir, "gen", "two.c")));
    }
}
