using Emit.Model;

namespace Emit.Tests.Cli;

/// <summary><c>compile --alarm-filter K/N</c> at the command line: what is written, and one-line errors (exit 2).</summary>
public sealed class AlarmFilterCliTests
{
    private static string ModelFile(string dir, double? threshold)
    {
        var path = Path.Combine(dir, "plant.json");
        ModelJson.WriteFile(TestModels.Random(ModelKind.Rbm, 10, 4, seed: 3).With(threshold, null), path, force: true);
        return path;
    }

    [Theory]
    [InlineData("0/5", "alarm filter 0/5 is out of range")]
    [InlineData("6/5", "alarm filter 6/5 is out of range")]
    [InlineData("3/33", "alarm filter 3/33 is out of range")]
    [InlineData("3of5", "is not K/N")]
    [InlineData("-1/5", "is not K/N")]
    public void Invalid_K_or_N_is_a_one_line_error_with_exit_2(string value, string message)
    {
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("compile", ModelFile(dir, 2.0), "--alarm-filter", value, "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("--alarm-filter: ", r.Error);
        Assert.Contains(message, r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
        Assert.False(Directory.Exists(Path.Combine(dir, "out")));
    }

    [Fact]
    public void A_model_without_threshold_is_refused_with_the_fix()
    {
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("compile", ModelFile(dir, null), "--alarm-filter", "3/5", "--out", Path.Combine(dir, "out"));
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("the model has no threshold", r.Error);
        Assert.Contains("emit calibrate", r.Error);
        Assert.Single(r.Error.TrimEnd('\n').Split('\n'));
    }

    [Theory]
    [InlineData("c")]
    [InlineData("csharp")]
    public void The_filter_is_in_the_banner_the_manifest_and_the_api(string target)
    {
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("compile", ModelFile(dir, 2.0), "--target", target, "--numeric", "fixed",
            "--alarm-filter", "1/1", "--out", dir);
        Assert.True(r.ExitCode == 0, r.Error);
        Assert.Contains("\"alarm_filter\": \"1/1\"", File.ReadAllText(Path.Combine(dir, "plant.emit.json")));
        if (target == "c")
        {
            var h = File.ReadAllText(Path.Combine(dir, "plant.h"));
            Assert.Contains("--alarm-filter 1/1", h);
            Assert.Contains("#define PLANT_FILTER_K 1\n#define PLANT_FILTER_N 1\n", h);
            Assert.Contains("} plant_filter_t;", h);
            Assert.Contains("void plant_filter_reset(plant_filter_t *filter);", h);
            Assert.Contains("bool plant_filter_update(plant_filter_t *filter, bool unusual);", h);
            Assert.Matches(@"#define PLANT_FILTER_FLASH_BYTES \d+\n#define PLANT_FILTER_RAM_BYTES 8\n", h);
            Assert.Contains("& 0x00000001u;", File.ReadAllText(Path.Combine(dir, "plant.c")));
        }
        else
        {
            var cs = File.ReadAllText(Path.Combine(dir, "plant.cs"));
            Assert.Contains("--alarm-filter 1/1", cs);
            Assert.Contains("public struct AlarmFilter", cs);
            Assert.Contains("public bool Update(bool unusual)", cs);
            Assert.Contains("public void Reset()", cs);
        }
    }

    [Fact]
    public void Without_the_option_nothing_of_the_filter_is_generated()
    {
        var dir = CliRunner.TempDir();
        var r = CliRunner.Run("compile", ModelFile(dir, 2.0), "--target", "c,csharp", "--out", dir);
        Assert.True(r.ExitCode == 0, r.Error);
        foreach (var f in new[] { "plant.h", "plant.c", "plant.cs", "plant.emit.json" })
        {
            var text = File.ReadAllText(Path.Combine(dir, f));
            Assert.DoesNotContain("filter", text, StringComparison.OrdinalIgnoreCase);
        }
    }
}
