using System.Globalization;
using Emit.Emission;
using Emit.Quantize;

namespace Emit.Harness;

/// <summary>
/// Accumulates one target's results against the reference, input by input, in constant memory, and gives the verdict:
/// a target passes when its largest error is within the bound, in fixed mode every result equals the integer
/// simulator's, both entry points agree, the embedded self-test passes, and every decision that differs from the
/// reference is explained by the bound (the reference free energy lies within bound + threshold rounding of the
/// threshold). With <c>failOnDecisionMismatch</c> any decision that differs fails the target, explained or not.
/// </summary>
public sealed class TargetComparison(NumericExpectation expectation, bool failOnDecisionMismatch = false)
{
    private const int Examples = 3;

    private readonly ErrorHistogram _histogram = new();
    private readonly List<string> _bitExamples = [], _decisionExamples = [], _entryExamples = [],
        _anyDecisionExamples = [];
    private long _count, _bitMismatches, _decisionMismatches, _unexplained, _entryMismatches, _worst = -1;
    private double _sum, _max;

    /// <summary>What the results are compared against.</summary>
    public NumericExpectation Expectation => expectation;

    /// <summary>Results compared so far.</summary>
    public long Count => _count;

    /// <summary>
    /// Compares the result for input <paramref name="index"/> (from 0); <paramref name="expectedRaw"/> is the
    /// simulator's integer in fixed mode.
    /// </summary>
    public void Add(long index, double reference, long? expectedRaw, in ScoredRow row)
    {
        var inv = CultureInfo.InvariantCulture;
        double generated = expectation.Decode(row.Bits);
        double error = Math.Abs(generated - reference);
        if (double.IsNaN(error)) error = double.PositiveInfinity;
        _count++;
        _sum += error;
        if (_worst < 0 || error > _max)
        {
            _max = error;
            _worst = index;
        }
        _histogram.Add(error);
        if (expectation.IsFixed && expectedRaw is { } want)
        {
            long got = expectation.RawInteger(row.Bits);
            if (got != want && _bitMismatches++ < Examples)
                _bitExamples.Add($"vector {index}: {got.ToString(inv)} instead of {want.ToString(inv)}");
        }
        if (!row.SameBits && _entryMismatches++ < Examples)
            _entryExamples.Add($"vector {index}");
        if (expectation.Threshold is { } t && row.Decision >= 0)
        {
            bool referenceUnusual = reference > t, generatedUnusual = row.Decision == 1;
            if (referenceUnusual != generatedUnusual)
            {
                if (_decisionMismatches++ < Examples)
                    _anyDecisionExamples.Add(
                        $"vector {index}: reference F = {reference.ToString("R", inv)}, generated F = " +
                        $"{generated.ToString("R", inv)}");
                if (!(Math.Abs(reference - t) <= expectation.ErrorBound + expectation.ThresholdAllowance)
                    && _unexplained++ < Examples)
                    _decisionExamples.Add(
                        $"vector {index}: reference F = {reference.ToString("R", inv)}, generated F = " +
                        $"{generated.ToString("R", inv)}, " +
                                          $"generated says {(generatedUnusual ? "unusual" : "usual")}");
            }
        }
    }

    /// <summary>
    /// The verdict and figures; <paramref name="runFailures"/> are failures to build or run the target,
    /// <paramref name="features"/> the checks of the firmware features emitted beside the scorer (each failing
    /// feature fails the target).
    /// </summary>
    public TargetResult Finish(string target, ScorerSources? sources, bool generatedHere, string modelSha256,
        int? selfTestFailures,
        IReadOnlyList<string> runFailures, double buildSeconds, double scoreSeconds, SourceCheckResult? check = null,
        IReadOnlyList<FeatureResult>? features = null)
    {
        var inv = CultureInfo.InvariantCulture;
        var failures = new List<string>(runFailures);
        features ??= [];
        foreach (var f in features.Where(f => !f.Passed))
            failures.Add($"{f.Feature}: {f.Mismatches} of {f.Checks} results disagree with the reference" +
                         (f.Failures.Count > 0 ? $" ({string.Join("; ", f.Failures)})" : ""));
        double bound = expectation.ErrorBound;
        if (_count > 0 && !(_max <= bound))
            failures.Add(
                $"largest |error| {_max.ToString("G4", inv)} nats (vector {_worst}) is above the bound " +
                $"{bound.ToString("G4", inv)} nats");
        if (_bitMismatches > 0)
            failures.Add(
                $"{_bitMismatches} of {_count} results differ from the integer simulator " +
                $"({string.Join("; ", _bitExamples)})");
        if (_unexplained > 0)
            failures.Add(
                $"{_unexplained} of {_decisionMismatches} decision mismatches are farther from the threshold than " +
                $"the bound allows ({string.Join("; ", _decisionExamples)})");
        if (failOnDecisionMismatch && _decisionMismatches > 0)
            failures.Add(
                $"{_decisionMismatches} of {_count} decisions differ from the reference, within the bound or not, " +
                "and every difference fails " +
                         $"({string.Join("; ", _anyDecisionExamples)})");
        if (_entryMismatches > 0)
            failures.Add(
                $"the packed and one-byte-per-unit entry points differ on {_entryMismatches} inputs " +
                $"({string.Join("; ", _entryExamples)})");
        if (selfTestFailures is > 0)
            failures.Add($"the embedded self-test reports {selfTestFailures} failing vectors");
        if (_count == 0 && failures.Count == 0 && check is not { Compare: false })
            failures.Add("no inputs were compared");
        return new TargetResult
        {
            Target = target,
            Numeric = expectation.Mode.ToText(),
            Weights = expectation.Weights,
            Vectors = _count,
            MaxAbsError = _count > 0 ? _max : null,
            MeanAbsError = _count > 0 ? _sum / _count : null,
            WorstVector = _count > 0 ? _worst : null,
            ErrorBound = bound,
            ErrorBoundBasis = expectation.BoundBasis,
            BitExact = expectation.IsFixed && _count > 0 ? _bitMismatches == 0 : null,
            BitMismatches = expectation.IsFixed ? _bitMismatches : null,
            DecisionMismatches = _decisionMismatches,
            UnexplainedMismatches = _unexplained,
            EntryPointMismatches = _entryMismatches,
            SelfTestFailures = selfTestFailures,
            Sources = generatedHere || sources is null ? "generated" : sources.Directory,
            SourceModelSha256 = generatedHere ? null : sources?.ModelSha256,
            ModelHashMatches = generatedHere || sources?.ModelSha256 == modelSha256,
            Manifest = generatedHere ? null : sources?.ManifestPath,
            SourcesMatch = generatedHere || check is null ? null : check.Edits.Count == 0 && !check.ModelChanged,
            Edits = check?.Edits ?? [],
            Compared = check is not { Compare: false },
            Features = features,
            Passed = failures.Count == 0,
            Seconds = buildSeconds + scoreSeconds,
            BuildSeconds = buildSeconds,
            SecondsPerVector = _count > 0 ? scoreSeconds / _count : null,
            Failures = failures,
            Histogram = _histogram,
        };
    }
}
