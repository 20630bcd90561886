using Emit.Model;

namespace Emit.Quantize;

internal sealed partial class PlanSearch
{
    /// <summary>
    /// Largest f ≤ MaxFractionBits with |round(maxAbs · 2^f)| ≤ wmax. A magnitude too large for
    /// <see cref="FixedRounding.Quantize"/> at some f is above any weight type there, so f is lowered without
    /// quantizing until the product is within 2^63.
    /// </summary>
    private static int FractionLimit(double maxAbs, long wmax)
    {
        int f = FixedPointPlanner.MaxFractionBits;
        while (maxAbs > 0
            && (Math.ScaleB(maxAbs, f) >= 9.2233720368547758E18 || FixedRounding.Quantize(maxAbs, f) > wmax)) f--;
        return f;
    }

    /// <summary>A column (or the lateral links) quantized at f fraction bits, with its signed sums.</summary>
    private sealed class Column
    {
        public required long[] Q;
        public required long Bias;           // hidden bias (columns only)
        public required Int128 Neg, Pos;     // Σ min(0, q), Σ max(0, q)
        public required ErrorInterval Delta; // bias error + [Σ min(0, Δw), Σ max(0, Δw)], nats
        public required double[] D;          // Δw per entry, nats
        public required double DC;           // bias error, nats
    }

    private Column GetColumn(int j, int f)
    {
        if (_columns.TryGetValue((j, f), out var c)) return c;
        int v = _m.Visible;
        var q = new long[v];
        var dd = new double[v];
        Int128 neg = 0, pos = 0;
        double dn = 0, dp = 0;
        for (int i = 0; i < v; i++)
        {
            double w = _m.Weight(i, j);
            q[i] = (long)FixedRounding.Quantize(w, f);
            if (q[i] < 0) neg += q[i]; else pos += q[i];
            double d = Math.ScaleB((double)q[i], -f) - w;
            dd[i] = d;
            if (d < 0) dn += d; else dp += d;
        }
        Int128 bias = FixedRounding.Quantize(_m.HiddenBias[j], f);
        double db = Math.ScaleB((double)bias, -f) - _m.HiddenBias[j];
        if (bias > long.MaxValue / 2 || bias < long.MinValue / 2) bias = long.MaxValue / 2;  // fails every range check
        c = new Column
        {
            Q = q,
            Bias = (long)bias,
            Neg = neg,
            Pos = pos,
            Delta = new ErrorInterval(dn + db, dp + db),
            D = dd,
            DC = db,
        };
        _columns[(j, f)] = c;
        return c;
    }

    /// <summary>
    /// Each hidden unit's fraction bits f_j: as many as the weight type allows, lowered until every range check of the
    /// unit fits the accumulator; false when some unit cannot fit at any f_j the table supports. Sets
    /// <paramref name="reduced"/> when some unit had to give up bits.
    /// </summary>
    private bool ChooseUnitFormats(SoftplusTable table, long lim, CheckSink checks, bool named, int[] f,
        IntRange[] outRange,
        Column[] cols, ref bool reduced)
    {
        int step = table.StepFractionBits;
        for (int j = 0; j < _m.Hidden; j++)
        {
            int fj = Math.Min(_weightLimit[j], FixedPointPlanner.MaxFractionBits);
            while (true)
            {
                if (fj < step) return false;
                var col = GetColumn(j, fj);
                var probe = new CheckSink(null, lim);
                UnitChecks(null, col, fj, table, probe, out outRange[j]);
                if (probe.Ok)
                {
                    if (named) UnitChecks("hidden[" + j + "]", col, fj, table, checks, out _);
                    cols[j] = col;
                    break;
                }
                fj--;
                reduced = true;
            }
            f[j] = fj;
        }
        return true;
    }

    private static Int128 Pow2(int k) => (Int128)1 << k;

    /// <summary>Range of to_energy(x, s) over x ∈ r, and of its intermediate (|x| + half, or x · 2^−s).</summary>
    private static (IntRange Result, IntRange Intermediate) RescaleRange(IntRange r, int s)
    {
        var result = new IntRange(FixedRounding.Rescale(r.Min, s), FixedRounding.Rescale(r.Max, s));
        // s ≤ 0: the constant factor 2^−s itself must be representable too.
        var mid = s > 0 ? new IntRange(0, r.MaxAbs + Pow2(s - 1)) : (Pow2(-s) * r).Hull(IntRange.Point(Pow2(-s)));
        return (result, mid);
    }

    /// <summary>Collects named range checks, or only tests them when no list is given (the search).</summary>
    private sealed class CheckSink(List<RangeCheck>? list, long limit)
    {
        public bool Ok { get; private set; } = true;

        public void Add(string? unit, string name, IntRange range)
        {
            if (!range.Within(limit)) Ok = false;
            list?.Add(new RangeCheck(unit is null ? name : unit + "." + name, range, limit));
        }
    }

    /// <summary>Ranges of a table lookup G_q(m) at index shift d: the limit P and the interpolation product.</summary>
    private static void LookupChecks(string? unit, string prefix, SoftplusTable table, int f, CheckSink checks)
    {
        int d = table.IndexShift(f);
        checks.Add(unit, prefix + "table_limit", IntRange.Point(table.Limit(f)));
        Int128 half = d > 0 ? Pow2(d - 1) : 0;
        checks.Add(unit, prefix + "interpolation_product", new IntRange(0, table.MaxEntryStep * Pow2(d) + half));
    }

    /// <summary>
    /// Checks of one hidden unit at f fraction bits; its output range (softplus_q value or score term z_j).
    /// </summary>
    private void UnitChecks(string? u, Column col, int f, SoftplusTable table, CheckSink checks, out IntRange output)
    {
        int e = table.FractionBits;
        var a = new IntRange(col.Bias + col.Neg, col.Bias + col.Pos);
        checks.Add(u, "accumulator", a);
        int s = f - e;
        if (_m.Kind == ModelKind.General)
        {
            var (z, mid) = RescaleRange(a, s);
            checks.Add(u, "to_energy", mid);
            checks.Add(u, "score_term", z);
            output = z;
        }
        else
        {
            LookupChecks(u, "", table, f, checks);
            Int128 posMax = 0;
            if (a.Max > 0)
            {
                var (pos, mid) = RescaleRange(new IntRange(Int128.Max(a.Min, 1), a.Max), s);
                checks.Add(u, "to_energy", mid);
                posMax = pos.Max;
            }
            output = new IntRange(0, posMax + table.Entries[0]);
            checks.Add(u, "softplus", output);
        }
    }
}
