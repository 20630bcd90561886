using System.Globalization;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;

namespace Emit.Harness;

/// <summary>
/// Checks streamed scoring on one target: for each input the harness runs the walk of <see cref="StreamWalk"/> and
/// reports the stream's free energy at two points; each must equal the integer simulator's free energy of the vector
/// reached (fixed mode, bit for bit) or lie within the stated stream bound plus the reference's own error of the
/// reference free energy of that vector (float modes).
/// </summary>
public sealed class StreamCheck(BoltzmannModel model, NumericExpectation expectation)
{
    private const int Examples = 3;
    private readonly ReferenceScorer _reference = new(model);
    private readonly List<string> _failures = [];
    private readonly double _bound = expectation.IsFixed
        ? expectation.ErrorBound
        : FloatErrorBound.StreamWorst(model, expectation.Mode, StreamWalk.Period(model.Visible))
          + FloatErrorBound.ReferenceWorst(model);
    private long _checks, _mismatches;
    private double _worst;

    /// <summary>Checks the stream group of one harness line for the input <paramref name="units"/>.</summary>
    public void Add(long index, ReadOnlySpan<byte> units, ReadOnlySpan<byte> packed, in ScoredRow row)
    {
        _checks++;
        var fields = row.Group("stream")?.Split(',');
        if (fields is not { Length: 2 })
        {
            Fail(index, "the harness line has no stream:FIRST,LAST group");
            return;
        }
        var walk = units.ToArray();
        var (first, last) = StreamWalk.Run(packed, walk);
        bool bad = false;
        foreach (var (text, vector, at) in new[] { (fields[0], first, StreamWalk.FirstRead(model.Visible)),
                                                   (fields[1], last, StreamWalk.Steps(model.Visible)) })
        {
            if (!ulong.TryParse(text, NumberStyles.AllowHexSpecifier, CultureInfo.InvariantCulture, out var bits))
            {
                bad = true;
                if (_mismatches < Examples) _failures.Add($"vector {index}: \"{text}\" is not a hex result");
                continue;
            }
            double got = expectation.Decode(bits), want = _reference.FreeEnergy(vector);
            double error = Math.Abs(got - want);
            if (double.IsNaN(error)) error = double.PositiveInfinity;
            _worst = Math.Max(_worst, error);
            if (expectation.Simulator is { } sim)
            {
                long raw = expectation.RawInteger(bits), exact = sim.FreeEnergy(vector);
                if (raw != exact)
                {
                    bad = true;
                    if (_mismatches < Examples)
                        _failures.Add($"vector {index}, flip {at}: {raw} instead of the simulator's {exact}");
                }
            }
            else if (!(error <= _bound))
            {
                bad = true;
                if (_mismatches < Examples)
                {
                    var inv = CultureInfo.InvariantCulture;
                    _failures.Add($"vector {index}, flip {at}: |error| {error.ToString("G4", inv)} " +
                                  $"above {_bound.ToString("G4", inv)}");
                }
            }
        }
        if (bad) _mismatches++;
    }

    private void Fail(long index, string why)
    {
        if (_mismatches++ < Examples) _failures.Add($"vector {index}: {why}");
    }

    /// <summary>The feature's result for the reports.</summary>
    public FeatureResult Result()
    {
        var inv = CultureInfo.InvariantCulture;
        var detail = expectation.IsFixed
            ? $"walks of {StreamWalk.Steps(model.Visible)} flips, read twice, bit-exact against the integer simulator"
            : $"walks of {StreamWalk.Steps(model.Visible)} flips, read twice, against the reference within " +
              $"{_bound.ToString("G4", inv)} nats (largest |error| {_worst.ToString("G4", inv)})";
        return new FeatureResult("stream", _checks, _mismatches, detail, _mismatches > 0 ? _failures : []);
    }
}
