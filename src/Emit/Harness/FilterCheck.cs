using System.Globalization;
using Emit.Detection;

namespace Emit.Harness;

/// <summary>
/// The check of a generated K-of-N alarm filter on one target (feature <c>filter</c>). The harness feeds every input's
/// generated decision, in input order across batches, through one filter and prints its output (<c>filter:0|1</c>).
/// Each output must equal Detection's K-of-N semantics (<see cref="AlarmFilterWindow"/>) applied to the same
/// generated decisions: that tests the filter itself, exactly. The filter of the reference decisions is counted
/// beside it and reported, not failed: it can differ only where a generated decision differs from the reference, and
/// the scorer's comparison already judges every such decision (explained by the error bound, or a failure).
/// </summary>
public sealed class FilterCheck(AlarmFilterSpec spec)
{
    private const int Examples = 3;

    private readonly AlarmFilterWindow _generated = new(spec), _reference = new(spec);
    private readonly List<string> _examples = [];
    private long _checks, _mismatches, _referenceDiffers;

    /// <summary>The filter checked.</summary>
    public AlarmFilterSpec Spec => spec;

    /// <summary>Checks the filter output on input <paramref name="index"/>.</summary>
    public void Add(long index, bool referenceUnusual, in ScoredRow row)
    {
        _checks++;
        bool expected = _generated.Push(row.Decision == 1);
        if (expected != _reference.Push(referenceUnusual)) _referenceDiffers++;
        var got = row.Group("filter");
        if (got == (expected ? "1" : "0")) return;
        if (_mismatches++ < Examples)
            _examples.Add(got is "0" or "1"
                ? $"vector {index.ToString(CultureInfo.InvariantCulture)}: the filter says {got}, " +
                  $"K-of-N of the generated decisions says {(expected ? 1 : 0)}"
                : $"vector {index.ToString(CultureInfo.InvariantCulture)}: no filter output");
    }

    /// <summary>The feature's result for the reports.</summary>
    public FeatureResult Finish() => new(
        "filter", _checks, _mismatches,
        $"{spec} of the generated decisions in input order; " +
        $"{_referenceDiffers.ToString(CultureInfo.InvariantCulture)} outputs differ from {spec} of the reference " +
        "decisions",
        _mismatches > 0 ? _examples : []);
}
