using Emit.Model;

namespace Emit.Quantize;

internal sealed partial class PlanSearch
{
    private Column GetLateral(int f)
    {
        if (_lateral.TryGetValue(f, out var c)) return c;
        var links = _m.VisibleLinks;
        var q = new long[links.Length];
        Int128 neg = 0, pos = 0;
        double dn = 0, dp = 0;
        for (int k = 0; k < links.Length; k++)
        {
            q[k] = (long)FixedRounding.Quantize(links[k].W, f);
            if (q[k] < 0) neg += q[k]; else pos += q[k];
            double d = Math.ScaleB((double)q[k], -f) - links[k].W;
            if (d < 0) dn += d; else dp += d;
        }
        c = new Column { Q = q, Bias = 0, Neg = neg, Pos = pos, Delta = new ErrorInterval(dn, dp), D = [], DC = 0 };
        _lateral[f] = c;
        return c;
    }

    /// <summary>
    /// The lateral links' fraction bits f_L: as large as the weight type allows, lowered until the lateral sum and its
    /// rescaling to E fit the accumulator; false when none does.
    /// </summary>
    private bool ChooseLateralFormat(int e, long lim, CheckSink checks, ref bool reduced, out Column lat, out int fl,
        out IntRange latE)
    {
        if (_m.VisibleLinks.IsEmpty)
        {
            fl = e;
            lat = GetLateral(fl);
            latE = IntRange.Point(0);
            return true;
        }
        fl = Math.Min(_lateralLimit, FixedPointPlanner.MaxFractionBits);
        while (true)
        {
            if (fl < -40)
            {
                lat = null!;
                latE = default;
                return false;
            }
            lat = GetLateral(fl);
            var r = new IntRange(lat.Neg, lat.Pos);
            var (res, mid) = RescaleRange(r, fl - e);
            latE = res;
            if (r.Within(lim) && mid.Within(lim))
            {
                checks.Add(null, "lateral.accumulator", r);
                checks.Add(null, "lateral.to_energy", mid);
                return true;
            }
            fl--;
            reduced |= fl < _lateralLimit;
        }
    }
}
