using System.Globalization;
using Emit.Emission;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Harness;

/// <summary>
/// The check of a generated classifier on one target (feature <c>classify</c>): the harness prints, per input, the
/// index <c>NAME_classify</c> returned and each score's bits (<c>classify:IDX,HEX1,HEX2,...</c>). Each score must lie
/// within the stated bound of the reference score −F_k(v) − log Z_k + log π_k (F_k from the double-precision
/// reference scorer, as <c>emit classify</c> computes it), and in fixed mode equal, bit for bit, the offset minus the
/// integer simulator's free energy; the index must be the reference's choice wherever the reference's top two scores
/// differ by more than twice the bound (docs/fixed-point.md §9); closer calls are counted, not failed.
/// </summary>
public sealed class ClassifyCheck
{
    private const int Examples = 3;

    private readonly ClassifierPlan _plan;
    private readonly ReferenceScorer[] _scorers;
    private readonly FixedPointSimulator[]? _simulators;
    private readonly NumericExpectation _expectation;
    private readonly List<string> _examples = [];
    private long _checks, _mismatches, _close;
    private double _worst;

    /// <summary>A check of <paramref name="plan"/>'s classifier; <paramref name="expectation"/> decodes a score's bits.
    /// </summary>
    public ClassifyCheck(ClassifierPlan plan, NumericExpectation expectation)
    {
        _plan = plan;
        _expectation = expectation;
        _scorers = plan.Models.Select(m => new ReferenceScorer(m.Model)).ToArray();
        _simulators = plan.OffsetUnits.Count > 0
            ? plan.Models.Select(m => new FixedPointSimulator(((FixedScorerPlan)m).Fixed)).ToArray()
            : null;
    }

    /// <summary>Checks input <paramref name="index"/> (<paramref name="units"/>: one byte per unit).</summary>
    public void Add(long index, ReadOnlySpan<byte> units, in ScoredRow row)
    {
        _checks++;
        var inv = CultureInfo.InvariantCulture;
        var fields = row.Group("classify")?.Split(',');
        if (fields is null || fields.Length != _plan.Count + 1
                           || !int.TryParse(fields[0], NumberStyles.None, inv, out int got))
        {
            Fail($"vector {index}: no classifier output");
            return;
        }
        var exact = new double[_plan.Count];
        bool bad = false;
        for (int k = 0; k < _plan.Count; k++)
        {
            exact[k] = _plan.Offsets[k] - _scorers[k].FreeEnergy(units);
            if (!ulong.TryParse(fields[k + 1], NumberStyles.AllowHexSpecifier, inv, out ulong bits))
            {
                Fail($"vector {index}: score {k} is not hex");
                return;
            }
            double score = _expectation.Decode(bits), error = Math.Abs(score - exact[k]);
            _worst = Math.Max(_worst, double.IsNaN(error) ? double.PositiveInfinity : error);
            // the reference scorer's own rounding (about 1e-12 nats) is allowed beside the bound
            if (!(error <= _plan.ScoreBound + 1e-9 * (1 + Math.Abs(exact[k]))))
            {
                bad = true;
                Describe($"vector {index}: score {k} = {score.ToString("R", inv)}, " +
                         $"reference {exact[k].ToString("R", inv)}");
            }
            if (_simulators is not null)
            {
                long want = _plan.OffsetUnits[k] - _simulators[k].FreeEnergy(units);
                long have = _expectation.RawInteger(bits);
                if (want != have)
                {
                    bad = true;
                    Describe($"vector {index}: score {k} = {have.ToString(inv)}, the simulator's {want.ToString(inv)}");
                }
            }
        }
        var order = Enumerable.Range(0, _plan.Count).OrderByDescending(k => exact[k]).ToArray();
        if (exact[order[0]] - exact[order[1]] > 2 * _plan.ScoreBound)
        {
            if (got != order[0])
            {
                bad = true;
                Describe($"vector {index}: class {got}, the reference's clear choice is {order[0]}");
            }
        }
        else _close++;
        if (bad) _mismatches++;
    }

    private void Fail(string what)
    {
        _mismatches++;
        Describe(what);
    }

    private void Describe(string what)
    {
        if (_examples.Count < Examples) _examples.Add(what);
    }

    /// <summary>The feature's result for the reports.</summary>
    public FeatureResult Finish() => new(
        "classify", _checks, _mismatches,
        string.Create(CultureInfo.InvariantCulture,
            $"{_plan.Count} models: scores within {_plan.ScoreBound:G3} nats of the reference " +
            $"(largest error {_worst:G3})" +
            $"{(_simulators is null ? "" : ", bit-exact against the simulator")}; index equal to the reference's " +
            $"choice where the top two differ by more than twice that; {_close} closer calls not judged"),
        _mismatches > 0 ? _examples : []);
}
