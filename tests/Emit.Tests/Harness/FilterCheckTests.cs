using Emit.Detection;
using Emit.Harness;

namespace Emit.Tests.Harness;

/// <summary>
/// The verify check of a generated alarm filter, fed harness rows directly: it follows the generated decisions, and
/// it fails on a wrong or missing output (a check that can fail).
/// </summary>
public sealed class FilterCheckTests
{
    private static ScoredRow Row(int decision, string? filter) =>
        new(0, true, (sbyte)decision, filter is null ? null : "filter:" + filter);

    [Fact]
    public void Outputs_equal_to_two_of_three_of_the_generated_decisions_pass()
    {
        // 2/3 by hand: decisions 1 0 1 1 0 0 → unusual among the last three 1 1 2 2 2 1 → on from the third to the fifth
        var check = new FilterCheck(new AlarmFilterSpec(2, 3));
        int[] decisions = [1, 0, 1, 1, 0, 0];
        string[] outputs = ["0", "0", "1", "1", "1", "0"];
        for (int i = 0; i < decisions.Length; i++) check.Add(i, decisions[i] == 1, Row(decisions[i], outputs[i]));
        var result = check.Finish();
        Assert.True(result.Passed);
        Assert.Equal("filter", result.Feature);
        Assert.Equal(6, result.Checks);
        Assert.Contains("0 outputs differ from 2/3 of the reference decisions", result.Detail);
    }

    [Fact]
    public void A_wrong_or_missing_output_fails()
    {
        var check = new FilterCheck(new AlarmFilterSpec(2, 3));
        check.Add(0, true, Row(1, "1"));   // one unusual of three: off
        check.Add(1, true, Row(1, null));
        var result = check.Finish();
        Assert.False(result.Passed);
        Assert.Equal(2, result.Mismatches);
        Assert.Contains("vector 0: the filter says 1", result.Failures[0]);
        Assert.Contains("vector 1: no filter output", result.Failures[1]);
    }

    [Fact]
    public void A_decision_that_differs_from_the_reference_is_counted_not_failed()
    {
        // the generated decision is usual where the reference says unusual (within the bound, say): the filter is
        // judged on the generated decisions; the difference from the reference's filter is reported
        var check = new FilterCheck(new AlarmFilterSpec(1, 2));
        check.Add(0, true, Row(0, "0"));
        check.Add(1, false, Row(0, "0"));
        var result = check.Finish();
        Assert.True(result.Passed);
        Assert.Contains("2 outputs differ from 1/2 of the reference decisions", result.Detail);
    }
}
