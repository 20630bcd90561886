using System.Globalization;
using Emit.Detection;
using Emit.Emission;
using Emit.Model;

namespace Emit.Harness;

/// <summary>
/// Checks explanations on one target against <see cref="UnitFlipExplainer"/> (the reference behind
/// <c>emit explain</c>): for each input the harness asks for <see cref="StreamWalk.ExplainUnits"/> units; there must be
/// min(that, VISIBLE) distinct units, each delta within the stated bound (plus the reference's own error) of the
/// reference ΔF of its unit, and in fixed mode equal bit for bit to the simulator's F(flipped) − F(v); and no unit
/// left out or placed later may have a reference ΔF lower by more than twice that tolerance (same order except where
/// two ΔF lie within the bound of each other).
/// </summary>
public sealed class ExplainCheck(BoltzmannModel model, NumericExpectation expectation)
{
    private const int Examples = 3;
    private readonly UnitFlipExplainer _explainer = new(model);
    private readonly List<string> _failures = [];
    private readonly double _tolerance = (expectation.IsFixed
                                             ? 2 * expectation.ErrorBound
                                             : FloatScorerPlan.ExplainBound(model, expectation.Mode))
                                         + 2 * Emit.Quantize.FloatErrorBound.ReferenceWorst(model);
    private long _checks, _mismatches;

    /// <summary>Checks the explain group of one harness line for the input <paramref name="units"/>.</summary>
    public void Add(long index, ReadOnlySpan<byte> units, in ScoredRow row)
    {
        _checks++;
        var why = Check(units, row.Group("explain"));
        if (why is null) return;
        if (_mismatches++ < Examples) _failures.Add($"vector {index}: {why}");
    }

    private string? Check(ReadOnlySpan<byte> units, string? group)
    {
        var inv = CultureInfo.InvariantCulture;
        if (group is null) return "the harness line has no explain group";
        var f = group.Split(',');
        int v = model.Visible, want = Math.Min(StreamWalk.ExplainUnits, v);
        if (!int.TryParse(f[0], inv, out int n) || n != want || f.Length != 1 + 2 * n)
            return $"\"{group}\" does not list {want} units";
        var exact = _explainer.Deltas(units);
        var listed = new List<int>();
        for (int p = 0; p < n; p++)
        {
            if (!int.TryParse(f[1 + 2 * p], inv, out int u) || u < 0 || u >= v || listed.Contains(u))
                return $"entry {p} names no new unit";
            if (!ulong.TryParse(f[2 + 2 * p], NumberStyles.AllowHexSpecifier, inv, out var bits))
                return $"entry {p} has no hex delta";
            double got = expectation.Decode(bits);
            if (!(Math.Abs(got - exact[u]) <= _tolerance))
                return $"unit {u}: delta {got.ToString("R", inv)} is not within {_tolerance.ToString("G4", inv)} of " +
                       $"the reference {exact[u].ToString("R", inv)}";
            if (expectation.Simulator is { } sim)
            {
                var flipped = units.ToArray();
                flipped[u] = flipped[u] != 0 ? (byte)0 : (byte)1;
                long expected = sim.FreeEnergy(flipped) - sim.FreeEnergy(units);
                if (expectation.RawInteger(bits) != expected)
                    return $"unit {u}: delta {expectation.RawInteger(bits)} is not the simulator's {expected}";
            }
            for (int w = 0; w < v; w++)
                if (!listed.Contains(w) && w != u && exact[w] < exact[u] - 2 * _tolerance)
                    return $"unit {w} (reference delta {exact[w].ToString("R", inv)}) should come before unit {u} " +
                           $"({exact[u].ToString("R", inv)})";
            listed.Add(u);
        }
        return null;
    }

    /// <summary>The feature's result for the reports.</summary>
    public FeatureResult Result() =>
        new("explain", _checks, _mismatches,
            $"{StreamWalk.ExplainUnits} units per input against the reference explainer within " +
            $"{_tolerance.ToString("G4", CultureInfo.InvariantCulture)} nats" +
            (expectation.IsFixed ? ", deltas bit-exact against the integer simulator" : ""),
            _mismatches > 0 ? _failures : []);
}
