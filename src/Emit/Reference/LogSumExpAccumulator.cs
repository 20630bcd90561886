namespace Emit.Reference;

/// <summary>
/// A running log Σ exp(x) kept as (max, Σ exp(x − max)), so no term overflows or underflows wholesale.
/// Combining accumulators in a fixed order gives the same bits however the terms were split among threads.
/// </summary>
public struct LogSumExpAccumulator
{
    private double _max;
    private double _sum;

    /// <summary>The empty sum (log 0 = −∞).</summary>
    public static LogSumExpAccumulator Empty => new() { _max = double.NegativeInfinity, _sum = 0 };

    /// <summary>Adds the term exp(<paramref name="x"/>).</summary>
    public void Add(double x)
    {
        if (x <= _max) _sum += Math.Exp(x - _max);
        else
        {
            _sum = _sum * Math.Exp(_max - x) + 1.0;
            _max = x;
        }
    }

    /// <summary>Adds every term of <paramref name="other"/>.</summary>
    public void Add(in LogSumExpAccumulator other)
    {
        if (other._sum == 0) return;
        if (other._max <= _max) _sum += other._sum * Math.Exp(other._max - _max);
        else
        {
            _sum = _sum * Math.Exp(_max - other._max) + other._sum;
            _max = other._max;
        }
    }

    /// <summary>log Σ exp(x); −∞ when empty.</summary>
    public readonly double Value => _sum == 0 ? double.NegativeInfinity : _max + Math.Log(_sum);
}
