using Emit.Detection;

namespace Emit.Tests.Detection;

/// <summary>
/// The K-of-N voting filter (common practice against chattering alarms) against a naive recount of each window, and
/// its option syntax; sample periods; the search for a threshold meeting a target of alarms per day.
/// </summary>
public sealed class AlarmFilterTests
{
    private static bool NaiveOn(bool[] unusual, int r, AlarmFilterSpec f)
    {
        int count = 0;
        for (int s = Math.Max(0, r - f.N + 1); s <= r; s++) if (unusual[s]) count++;
        return count >= f.K;
    }

    [Fact]
    public void Run_counts_raises_and_rows_in_alarm_as_a_naive_window_recount_does()
    {
        var rng = new Random(11);
        for (int trial = 0; trial < 300; trial++)
        {
            int n = rng.Next(1, AlarmFilterSpec.MaxN + 1);
            var f = new AlarmFilterSpec(rng.Next(1, n + 1), n);
            int rows = rng.Next(1, 400);
            double p = rng.NextDouble();
            var energies = Enumerable.Range(0, rows).Select(_ => rng.NextDouble() < p ? 2.0 : 0.0).ToArray();
            var unusual = energies.Select(e => e > 1.0).ToArray();
            long raised = 0, inAlarm = 0;
            int? first = null;
            for (int r = 0; r < rows; r++)
            {
                bool on = NaiveOn(unusual, r, f);
                if (on) { inAlarm++; first ??= r + 1; }
                if (on && (r == 0 || !NaiveOn(unusual, r - 1, f))) raised++;
            }
            var run = AlarmFilter.Run(energies, 1.0, f);
            Assert.Equal(rows, run.Rows);
            Assert.Equal(unusual.Count(u => u), run.Unusual);
            Assert.Equal(raised, run.Raised);
            Assert.Equal(inAlarm, run.RowsInAlarm);
            Assert.Equal(first, AlarmFilter.ReportsUntilRaised(energies, 1.0, f));
        }
    }

    [Fact]
    public void Three_of_five_on_a_hand_worked_log()
    {
        // unusual (F > 1) at reports 1 1 0 1 0 0 1 1 1 0; the window of the last five reports ending at report r:
        double[] e = [5, 5, 0, 5, 0, 0, 5, 5, 5, 0];
        // windows ending at 1-based r: r=4 {1,1,0,1}=3 on; r=5 {1,1,0,1,0}=3 on; r=6 {1,0,1,0,0}=2 off;
        // r=7 {0,1,0,0,1}=2 off; r=8 {1,0,0,1,1}=3 on; r=9 {0,0,1,1,1}=3 on; r=10 {0,1,1,1,0}=3 on
        var run = AlarmFilter.Run(e, 1, AlarmFilterSpec.Parse("3/5"));
        Assert.Equal(2, run.Raised);
        Assert.Equal(5, run.RowsInAlarm);
        Assert.Equal(4, AlarmFilter.ReportsUntilRaised(e, 1, AlarmFilterSpec.Parse("3/5")));
        Assert.Null(AlarmFilter.ReportsUntilRaised([0, 0, 5], 1, AlarmFilterSpec.Parse("2/3")));
    }

    [Theory]
    [InlineData("3/5", 3, 5)]
    [InlineData(" 1 / 1 ", 1, 1)]
    [InlineData("32/32", 32, 32)]
    public void Spec_parses(string text, int k, int n)
    {
        var f = AlarmFilterSpec.Parse(text);
        Assert.Equal((k, n), (f.K, f.N));
        Assert.Equal($"{k}/{n}", f.ToString());
    }

    [Theory]
    [InlineData("0/5")]
    [InlineData("6/5")]
    [InlineData("1/33")]
    [InlineData("3")]
    [InlineData("3/5/7")]
    [InlineData("-1/5")]
    [InlineData("a/b")]
    public void Bad_specs_are_refused(string text) => Assert.Throws<EmitException>(() => AlarmFilterSpec.Parse(text));

    [Theory]
    [InlineData("5m", 300)]
    [InlineData("30s", 30)]
    [InlineData("1h", 3600)]
    [InlineData("1d", 86400)]
    [InlineData("250ms", 0.25)]
    [InlineData("1.5h", 5400)]
    public void Sample_periods_parse(string text, double seconds) => Assert.Equal(seconds, SamplePeriod.ParseSeconds(text), 12);

    [Theory]
    [InlineData("5")]
    [InlineData("0s")]
    [InlineData("-5m")]
    [InlineData("5 minutes")]
    [InlineData("m")]
    [InlineData("5mm")]
    public void Bad_periods_are_refused(string text) => Assert.Throws<EmitException>(() => SamplePeriod.ParseSeconds(text));

    [Fact]
    public void Target_search_meets_the_target_and_is_lowest_when_the_count_is_monotone()
    {
        var rng = new Random(5);
        for (int trial = 0; trial < 40; trial++)
        {
            var log = Enumerable.Range(0, 500).Select(_ => Math.Round(rng.NextDouble() * 100)).ToArray();
            var f = new AlarmFilterSpec(rng.Next(1, 4), 4);
            double period = 300, target = rng.NextDouble() * 30;
            var (t, run) = AlarmRateSearch.ForTarget(log, f, period, target);
            double allowed = target * log.Length * period / 86400;
            Assert.Equal(AlarmFilter.Run(log, t, f), run);
            Assert.True(run.Raised <= allowed);
            // brute force over every candidate
            var candidates = log.Distinct().Order().ToArray();
            var counts = candidates.Select(c => AlarmFilter.Run(log, c, f).Raised).ToArray();
            bool monotone = counts.Zip(counts.Skip(1)).All(p => p.First >= p.Second);
            if (monotone) Assert.Equal(candidates.First(c => AlarmFilter.Run(log, c, f).Raised <= allowed), t);
        }
    }
}
