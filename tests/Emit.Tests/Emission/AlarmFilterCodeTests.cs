using System.Collections.Immutable;
using Emit.Detection;
using Emit.Emission;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Tests.Harness;

namespace Emit.Tests.Emission;

/// <summary>
/// The generated K-of-N alarm filter (<c>compile --alarm-filter K/N</c>) run on every target through the verify
/// harness, on decision sequences whose filter outputs were worked out by hand from the definition in
/// docs/generated-code.md ("on while at least K of the last N decisions, the latest included, were unusual; before N
/// decisions the missing ones count as usual"), and on random sequences against Detection's K-of-N filter
/// (<see cref="AlarmFilterWindow"/>, the semantics calibration counts alarms with).
/// </summary>
public sealed class AlarmFilterCodeTests
{
    /// <summary>
    /// A model whose decision is unit 0: F(v) = −b·v − softplus(c + W·v) with b0 = −4 is about 2.7 nats with unit 0
    /// on and at most −0.6 with it off (the other units small), so threshold 1 makes "unusual" mean "unit 0 on".
    /// </summary>
    private static BoltzmannModel Switch() => new(ModelKind.Rbm, 3, 1,
        ImmutableArray.Create(-4.0, 0.1, 0.2), ImmutableArray.Create(0.1), ImmutableArray.Create(0.1, 0.2, 0.3),
        threshold: 1.0);

    /// <summary>
    /// 3/5 worked by hand. Decisions 1 1 0 1 0 0 1 1 1 0 0 0; the unusual ones among the last five: 1 2 2 3 3 2 2 3 3 3
    /// 3 2 (at step 6 the first decision leaves the window); on where that is at least 3.
    /// </summary>
    private static readonly int[] Decisions35 = [1, 1, 0, 1, 0, 0, 1, 1, 1, 0, 0, 0];
    private static readonly int[] Filtered35 = [0, 0, 0, 1, 1, 0, 0, 1, 1, 1, 1, 0];

    /// <summary>Feeds <paramref name="decisions"/> through the generated filter on <paramref name="target"/>.</summary>
    private static int[] Run(string target, NumericMode mode, AlarmFilterSpec spec, IReadOnlyList<int> decisions,
        int? imageInputs = null)
    {
        var runner = Runners.Find(target)!;
        var settings = VerifyCases.Settings(imageInputs);
        VerifyCases.Require(target);
        var model = Switch();
        var dir = Toolchain.TempDir("filter");
        var options = new CompileOptions([runner.Language], mode, "sw", AlarmFilter: spec);
        OutputFolder.Write(dir, ScorerCompiler.Build(model, "sw.json", options), force: true);
        var sources = ScorerSources.Locate(dir, runner.Language, "sw", "sw");
        var layout = NumericExpectation.For(model, mode, mode == NumericMode.Fixed ? new FixedPointOptions() : null)
            .Layout(model);
        using var session = runner.Start(sources, layout, settings, Path.Combine(dir, "work"), out var failure);
        Assert.True(session is not null, failure);
        var packed = new byte[decisions.Count];
        for (int r = 0; r < decisions.Count; r++) packed[r] = (byte)(decisions[r] | (r % 3 == 0 ? 2 : 0) | (r % 2 << 2));
        var rows = new ScoredRow[decisions.Count];
        Assert.True(session.TryScore(packed, decisions.Count, rows, out failure), failure);
        Assert.Equal(decisions, rows.Select(r => (int)r.Decision));
        return rows.Select(r => r.Group("filter") switch
        {
            "1" => 1,
            "0" => 0,
            var g => throw new Xunit.Sdk.XunitException($"filter group \"{g}\" in \"{r.Features}\""),
        }).ToArray();
    }

    [SkippableTheory]
    [InlineData("c", NumericMode.F32)]
    [InlineData("c", NumericMode.Fixed)]
    [InlineData("csharp", NumericMode.F32)]
    [InlineData("csharp", NumericMode.Fixed)]
    [InlineData("cortex-m3", NumericMode.F32)]
    [InlineData("cortex-m3", NumericMode.Fixed)]
    public void Three_of_five_matches_the_hand_worked_sequence(string target, NumericMode mode)
    {
        // five inputs per Cortex-M3 image: the state must run on across images
        Assert.Equal(Filtered35, Run(target, mode, new AlarmFilterSpec(3, 5), Decisions35, imageInputs: 5));
    }

    [SkippableTheory]
    [InlineData("c")]
    [InlineData("csharp")]
    public void One_of_one_passes_every_decision_through(string target)
    {
        int[] decisions = [0, 1, 1, 0, 1, 0, 0, 1];
        Assert.Equal(decisions, Run(target, NumericMode.F32, new AlarmFilterSpec(1, 1), decisions));
    }

    [SkippableTheory]
    [InlineData("c")]
    [InlineData("csharp")]
    public void Thirty_two_of_thirty_two_needs_a_full_window_of_unusual_decisions(string target)
    {
        // by hand: 32 unusual → on only at the 32nd; one usual → off, and off again for the next 31 unusual
        int[] decisions = [.. Enumerable.Repeat(1, 32), 0, .. Enumerable.Repeat(1, 32)];
        int[] expected = [.. Enumerable.Repeat(0, 31), 1, 0, .. Enumerable.Repeat(0, 31), 1];
        Assert.Equal(expected, Run(target, NumericMode.Fixed, new AlarmFilterSpec(32, 32), decisions));
    }

    [SkippableTheory]
    [InlineData("c")]
    [InlineData("csharp")]
    public void One_of_thirty_two_holds_an_alarm_for_exactly_thirty_two_decisions(string target)
    {
        // by hand: one unusual decision stays in the window for itself and the 31 after it (bit 31 leaves last)
        int[] decisions = [1, .. Enumerable.Repeat(0, 40)];
        int[] expected = [.. Enumerable.Repeat(1, 32), .. Enumerable.Repeat(0, 9)];
        Assert.Equal(expected, Run(target, NumericMode.F32, new AlarmFilterSpec(1, 32), decisions));
    }

    [SkippableFact]
    public void Random_sequences_agree_with_Detections_filter()
    {
        var rng = new Random(20261203);
        foreach (var (k, n) in new[] { (2, 3), (4, 7), (5, 16), (17, 31), (9, 32), (1, 2) })
        {
            var spec = new AlarmFilterSpec(k, n);
            var decisions = Enumerable.Range(0, 300).Select(_ => rng.NextDouble() < 0.45 ? 1 : 0).ToArray();
            var window = new AlarmFilterWindow(spec);
            var expected = decisions.Select(d => window.Push(d == 1) ? 1 : 0).ToArray();
            Assert.Equal(expected, Run("c", NumericMode.F32, spec, decisions));
        }
    }
}
