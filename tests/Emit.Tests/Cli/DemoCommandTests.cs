using Emit.Model;

namespace Emit.Tests.Cli;

public sealed class DemoCommandTests
{
    private static string DemoDir()
    {
        var d = new DirectoryInfo(AppContext.BaseDirectory);
        while (!Directory.Exists(Path.Combine(d.FullName, "demo-data"))) d = d.Parent!;
        return Path.Combine(d.FullName, "demo-data");
    }

    [Fact]
    public void Demo_runs_on_the_shipped_data_and_carries_the_caution()
    {
        var dir = DemoDir();
        var r = CliRunner.Run("demo", "--data", dir);
        Assert.Equal(0, r.ExitCode);
        Assert.Contains(ModelLoader.Load(Path.Combine(dir, "reefer-fleet.json")).Sha256, r.Out);
        Assert.Matches(@"normal\.csv: \d+ of 2000 flagged", r.Out);
        Assert.Matches(@"faulty\.csv: \d+ of 400 flagged", r.Out);
        Assert.Contains("monitoring aid, not a safety function", r.Out);
    }

    [Fact]
    public void Demo_without_data_says_where_it_looked()
    {
        var r = CliRunner.Run("demo", "--data", CliRunner.TempDir());
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("reefer-fleet.json", r.Error);
    }
}
