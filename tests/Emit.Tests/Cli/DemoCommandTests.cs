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
        // the generated C compiled and verified on the host (skipped with the package to install when there is no cc)
        Assert.Matches(@"4\. compile   emit compile --target c --numeric f32: reefer_fleet\.h \(\d+ KiB\), reefer_fleet\.c", r.Out);
        if (Emit.Harness.Tool.Find("cc") is null && !Emit.Tests.Emission.Toolchain.InCi)
            Assert.Contains("5. verify    skipped: target c: C compiler \"cc\" not found (install the Debian package gcc", r.Out);
        else
            Assert.Matches(@"5\. verify    emit verify --target c over normal\.csv: 2000 vectors[^\n]*\n\s+max \|error\| \S+ nats.*: pass\n", r.Out);
        // the recalibration compared with emit diff on both logs; every vector is counted once
        Assert.Matches(@"6\. diff      a recalibration", r.Out);
        foreach (var (file, rows) in new[] { ("normal", 2000), ("faulty", 400) })
        {
            var m = System.Text.RegularExpressions.Regex.Match(r.Out, file + @"\.csv: (\d+) newly unusual, (\d+) no longer unusual, (\d+) unchanged");
            Assert.True(m.Success, r.Out);
            Assert.Equal(rows, Enumerable.Range(1, 3).Sum(g => int.Parse(m.Groups[g].Value, System.Globalization.CultureInfo.InvariantCulture)));
        }
    }

    [Fact]
    public void Demo_without_data_says_where_it_looked()
    {
        var r = CliRunner.Run("demo", "--data", CliRunner.TempDir());
        Assert.Equal(2, r.ExitCode);
        Assert.Contains("reefer-fleet.json", r.Error);
    }
}
