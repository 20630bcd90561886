using System.Collections.Immutable;
using Emit.Model;
using Emit.Reference;

namespace Emit.Quantize;

/// <summary>The candidate search behind <see cref="FixedPointPlanner"/> (caches quantized columns and tables).</summary>
internal sealed class PlanSearch
{
    private readonly BoltzmannModel _m;
    private readonly FixedPointOptions _o;
    private readonly RangeAnalysis _real;
    private readonly int[] _weightLimit;      // per column: most fraction bits the weight type allows
    private readonly int _lateralLimit;
    private readonly Dictionary<(int J, int F), Column> _columns = new();
    private readonly Dictionary<int, Column> _lateral = new();
    private readonly Dictionary<(int Rho, int E), SoftplusTable?> _tables = new();
    private readonly double _slack;
    private readonly Dictionary<string, ErrorInterval> _coupled = new();

    public PlanSearch(BoltzmannModel model, FixedPointOptions options)
    {
        _m = model;
        _o = options;
        _real = RangeAnalysis.Of(model);
        long wmax = options.Weights.MaxMagnitude();
        _weightLimit = new int[model.Hidden];
        for (int j = 0; j < model.Hidden; j++)
        {
            double maxAbs = 0;
            for (int i = 0; i < model.Visible; i++) maxAbs = Math.Max(maxAbs, Math.Abs(model.Weight(i, j)));
            _weightLimit[j] = FractionLimit(maxAbs, wmax);
        }
        _lateralLimit = FractionLimit(model.VisibleLinks.Select(l => Math.Abs(l.W)).DefaultIfEmpty(0).Max(), wmax);
        double scale = 1 + _real.FreeEnergy.MaxAbs + _real.Hidden.Sum(r => r.MaxAbs) + _real.LateralTerm.MaxAbs + _real.HiddenLinkTerm.MaxAbs;
        _slack = 1e-12 * scale;
        double sp = 0;
        foreach (var r in _real.Hidden) sp += Math.Max(0, r.Max) + Math.Log(2);
        var linear = _real.VisibleBiasTerm + _real.LateralTerm;
        _energyMagnitude = Math.Max(Math.Abs(linear.Min), Math.Abs(linear.Max + sp));
        if (model.Kind == ModelKind.General) _energyMagnitude += _real.HiddenLinkTerm.MaxAbs;
    }

    private readonly double _energyMagnitude;

    /// <summary>
    /// Largest f ≤ MaxFractionBits with |round(maxAbs · 2^f)| ≤ wmax. A magnitude too large for
    /// <see cref="FixedRounding.Quantize"/> at some f is above any weight type there, so f is lowered without
    /// quantizing until the product is within 2^63.
    /// </summary>
    private static int FractionLimit(double maxAbs, long wmax)
    {
        int f = FixedPointPlanner.MaxFractionBits;
        while (maxAbs > 0 && (Math.ScaleB(maxAbs, f) >= 9.2233720368547758E18 || FixedRounding.Quantize(maxAbs, f) > wmax)) f--;
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
        c = new Column { Q = q, Bias = (long)bias, Neg = neg, Pos = pos, Delta = new ErrorInterval(dn + db, dp + db), D = dd, DC = db };
        _columns[(j, f)] = c;
        return c;
    }

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

    private SoftplusTable? GetTable(int rho, int e)
    {
        if (_tables.TryGetValue((rho, e), out var t)) return t;
        try { t = new SoftplusTable(_o.SoftplusTableSize, rho, e); }
        catch (OverflowException) { t = null; }
        _tables[(rho, e)] = t;
        return t;
    }

    /// <summary>A feasible choice of formats with its bound (arrays are built only for the winner).</summary>
    internal sealed class Candidate
    {
        public required AccumulatorType Acc;
        public required SoftplusTable Table;
        public required int[] F;
        public required int LateralF;
        public required long[] VisibleBias;
        public required long[] HiddenLinks;
        public required long Offset;
        public required ErrorBudget Budget;
        public List<RangeCheck> Checks = [];
        public required ErrorInterval[] UnitError;
    }

    /// <summary>The candidate with the smallest bound for one accumulator type, or null.</summary>
    public Candidate? Best(AccumulatorType acc)
    {
        Candidate? best = null;
        int logN = System.Numerics.BitOperations.Log2((uint)_o.SoftplusTableSize);
        double reach = _real.Hidden.Select(r => r.MaxAbs).DefaultIfEmpty(0).Max();
        if (_m.Kind == ModelKind.General) reach = Math.Max(reach, 2 * _energyMagnitude);
        for (int rho = FixedPointPlanner.MinRangeLog2; rho <= FixedPointPlanner.MaxRangeLog2; rho++)
        {
            // A table reaching past every input only gets coarser as R grows further.
            if (best is not null && Math.ScaleB(1.0, rho - 1) > reach) break;
            int step = logN - rho;
            for (int e = FixedPointPlanner.MaxEnergyFractionBits; e >= 0; e--)
            {
                if (_m.Kind == ModelKind.General && e < step) break;
                // The energy's partial sums reach about this magnitude · 2^E: skip E values that cannot fit.
                if (Math.ScaleB(_energyMagnitude, e) > 1.01 * acc.MaxMagnitude()) continue;
                var table = GetTable(rho, e);
                if (table is null) continue;
                var c = TryPlan(acc, table, null, out bool reduced);
                if (c is not null && (best is null || c.Budget.Bound < best.Budget.Bound)) best = c;
                // With every format at its weight-type limit a smaller E can only add rounding error.
                if (c is not null && !reduced) break;
            }
        }
        return best;
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

    /// <summary>Checks of one hidden unit at f fraction bits; its output range (softplus_q value or score term z_j).</summary>
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

    /// <summary>
    /// One candidate: formats for (acc, table), range checks, and the error budget. With <paramref name="named"/>
    /// null the cheap per-unit hidden-input enclosure is used (search); otherwise the coupled one, and the checks
    /// are collected into <paramref name="named"/>.
    /// </summary>
    private Candidate? TryPlan(AccumulatorType acc, SoftplusTable table, List<RangeCheck>? named, out bool reduced)
    {
        long lim = acc.MaxMagnitude();
        int e = table.FractionBits, step = table.StepFractionBits, h = _m.Hidden, v = _m.Visible;
        bool general = _m.Kind == ModelKind.General;
        var checks = new CheckSink(named, lim);
        var f = new int[h];
        var outRange = new IntRange[h];
        var cols = new Column[h];
        reduced = false;
        for (int j = 0; j < h; j++)
        {
            int fj = Math.Min(_weightLimit[j], FixedPointPlanner.MaxFractionBits);
            while (true)
            {
                if (fj < step) return null;
                var col = GetColumn(j, fj);
                var probe = new CheckSink(null, lim);
                UnitChecks(null, col, fj, table, probe, out outRange[j]);
                if (probe.Ok)
                {
                    if (named is not null) UnitChecks("hidden[" + j + "]", col, fj, table, checks, out _);
                    cols[j] = col;
                    break;
                }
                fj--;
                reduced = true;
            }
            f[j] = fj;
        }

        // Lateral links: f_L as large as the weight type allows, lowered until the sum and its rescaling fit.
        Column lat;
        int fl;
        IntRange latE;
        if (_m.VisibleLinks.IsEmpty)
        {
            fl = e;
            lat = GetLateral(fl);
            latE = IntRange.Point(0);
        }
        else
        {
            fl = Math.Min(_lateralLimit, FixedPointPlanner.MaxFractionBits);
            while (true)
            {
                if (fl < -40) return null;
                lat = GetLateral(fl);
                var r = new IntRange(lat.Neg, lat.Pos);
                var (res, mid) = RescaleRange(r, fl - e);
                latE = res;
                if (r.Within(lim) && mid.Within(lim))
                {
                    checks.Add(null, "lateral.accumulator", r);
                    checks.Add(null, "lateral.to_energy", mid);
                    break;
                }
                fl--;
                reduced |= fl < _lateralLimit;
            }
        }

        // Visible biases at E bits.
        var bq = new long[v];
        Int128 bNeg = 0, bPos = 0;
        double dbn = 0, dbp = 0;
        for (int i = 0; i < v; i++)
        {
            Int128 q = FixedRounding.Quantize(_m.VisibleBias[i], e);
            if (Int128.Abs(q) > lim) return null;
            bq[i] = (long)q;
            if (q < 0) bNeg += q; else bPos += q;
            double d = Math.ScaleB((double)q, -e) - _m.VisibleBias[i];
            if (d < 0) dbn += d; else dbp += d;
        }
        double lsb = Math.ScaleB(1.0, -e);
        var biasErr = new ErrorInterval(dbn, dbp);
        var latErr = _m.VisibleLinks.IsEmpty ? ErrorInterval.Zero
            : lat.Delta + (fl - e > 0 ? lsb * new ErrorInterval(-0.5, 0.5) : ErrorInterval.Zero);

        // Hidden part.
        var unitErr = new ErrorInterval[h];
        var sLo = new double[h];
        var sHi = new double[h];
        var softplusErr = ErrorInterval.Zero;
        var lseErr = ErrorInterval.Zero;
        var extra = ErrorInterval.Zero;   // general: to_energy rounding and hidden-link rounding
        long[] mq = [];
        IntRange hiddenOut;
        if (!general)
        {
            Int128 yMax = 0;
            for (int j = 0; j < h; j++) yMax += outRange[j].Max;
            hiddenOut = new IntRange(0, yMax);
            // Cheap test before the error analysis (the offset K is added and checked again below).
            var sum0 = new IntRange(bNeg, bPos) + latE + hiddenOut;
            if (!checks.Ok || !sum0.Within(lim)) return null;
            for (int j = 0; j < h; j++)
            {
                var a = new IntRange(cols[j].Bias + cols[j].Neg, cols[j].Bias + cols[j].Pos);
                var x = _real.Hidden[j];
                double qLo = Math.ScaleB((double)a.Min, -f[j]), qHi = Math.ScaleB((double)a.Max, -f[j]);
                sLo[j] = Softplus.Sigmoid(Math.Min(x.Min, qLo));
                sHi[j] = Softplus.Sigmoid(Math.Max(x.Max, qHi));
                var eval = table.SoftplusError(a.Min, a.Max, f[j]);
                unitErr[j] = new ErrorInterval(sLo[j], sHi[j]).Times(cols[j].Delta) + eval;
                softplusErr += eval;
            }
        }
        else
        {
            var links = _m.HiddenLinks;
            mq = new long[links.Length];
            var field = new IntRange[h];
            for (int j = 0; j < h; j++) field[j] = outRange[j];
            Int128 sNeg = 0, sPos = 0;
            for (int k = 0; k < links.Length; k++)
            {
                Int128 q = FixedRounding.Quantize(links[k].W, e);
                if (Int128.Abs(q) > lim) return null;
                mq[k] = (long)q;
                var qr = q < 0 ? new IntRange(q, 0) : new IntRange(0, q);
                field[links[k].I] += qr;
                field[links[k].J] += qr;
                if (q < 0) sNeg += q; else sPos += q;
                double d = Math.ScaleB((double)q, -e) - links[k].W;
                extra += new ErrorInterval(d, d).WithZero();
            }
            for (int j = 0; j < h; j++)
            {
                checks.Add("hidden[" + j + "]", "field", field[j]);
                var z = outRange[j];
                sNeg += Int128.Min(0, z.Min);
                sPos += Int128.Max(0, z.Max);
                var rounding = f[j] - e > 0 ? lsb * new ErrorInterval(-0.5, 0.5) : ErrorInterval.Zero;
                unitErr[j] = cols[j].Delta + rounding;
                extra += rounding.WithZero();
                sLo[j] = 0;
                sHi[j] = 1;
            }
            var score = new IntRange(sNeg, sPos);
            checks.Add(null, "general.score", score);
            Int128 g0 = table.Entries[0];
            var tree = new IntRange(score.Min, score.Max + h * g0);
            checks.Add(null, "general.tree", tree);
            var diff = new IntRange(0, tree.Max - tree.Min);
            checks.Add(null, "general.difference", diff);
            LookupChecks("general.lse", "", table, e, checks);
            lseErr = h * table.GError(0, diff.Max, e);
            hiddenOut = tree;
        }
        var hiddenInputs = HiddenInputs(f, cols, sLo, sHi, coupled: named is not null) + extra;

        if (!checks.Ok) return null;

        // Centre the total error interval with the energy offset K.
        var positive = biasErr + latErr + hiddenInputs + softplusErr + lseErr;
        Int128 k0 = FixedRounding.Quantize(-positive.Mid, e);
        if (Int128.Abs(k0) > lim) return null;
        long offset = (long)k0;
        double offsetReal = Math.ScaleB((double)offset, -e);
        var total = -positive.Shift(offsetReal);

        var linear = new IntRange(offset + bNeg, offset + bPos);
        checks.Add(null, "energy.linear", linear);
        var baseRange = linear + latE;
        checks.Add(null, "energy.base", baseRange);
        var sum = new IntRange(baseRange.Min + Int128.Min(0, hiddenOut.Min), baseRange.Max + Int128.Max(0, hiddenOut.Max));
        checks.Add(null, "energy.sum", sum);
        checks.Add(null, "energy.result", -sum);
        if (!checks.Ok) return null;

        var budget = new ErrorBudget
        {
            VisibleBias = biasErr,
            Lateral = latErr,
            HiddenInputs = hiddenInputs,
            Softplus = softplusErr,
            LogSumExp = lseErr,
            Offset = offsetReal,
            Slack = _slack,
            Total = total,
        };
        return new Candidate
        {
            Acc = acc, Table = table, F = f, LateralF = fl, VisibleBias = bq, HiddenLinks = mq, Offset = offset,
            Budget = budget, UnitError = unitErr,
        };
    }

    /// <summary>
    /// Enclosure of Σ_j s_j δ_j(v) (slopes s_j ∈ [sLo_j, sHi_j]): per unit during the search; coupled (row-wise
    /// with a spectral-norm term, see <see cref="CoupledBound"/>) for the final plan, cached per choice of formats.
    /// </summary>
    private ErrorInterval HiddenInputs(int[] f, Column[] cols, double[] sLo, double[] sHi, bool coupled)
    {
        int h = _m.Hidden, v = _m.Visible;
        if (!coupled)
        {
            var sum = ErrorInterval.Zero;
            for (int j = 0; j < h; j++) sum += new ErrorInterval(sLo[j], sHi[j]).Times(cols[j].Delta);
            return sum;
        }
        string key = string.Join(",", f);
        if (_coupled.TryGetValue(key, out var cached)) return cached;
        var dW = new double[v * h];
        var dC = new double[h];
        for (int j = 0; j < h; j++)
        {
            dC[j] = cols[j].DC;
            var d = cols[j].D;
            for (int i = 0; i < v; i++) dW[i * h + j] = d[i];
        }
        var result = CoupledBound.Compute(v, h, dW, dC, sLo, sHi, spectral: true);
        _coupled[key] = result;
        return result;
    }

    /// <summary>Re-evaluates a search winner with the coupled hidden-input enclosure and named range checks.</summary>
    public Candidate Refine(Candidate c)
    {
        var checks = new List<RangeCheck>();
        var refined = TryPlan(c.Acc, c.Table, checks, out _)
            ?? throw new InvalidOperationException("a feasible candidate became infeasible");
        refined.Checks = checks;
        return refined;
    }

    /// <summary>Builds the plan's arrays for the chosen candidate.</summary>
    public FixedPointPlan Materialize(Candidate c, string reason)
    {
        int v = _m.Visible, h = _m.Hidden, e = c.Table.FractionBits;
        var w = new long[v * h];
        var units = ImmutableArray.CreateBuilder<HiddenUnitPlan>(h);
        int wbits = _o.Weights.Bits(), abits = c.Acc.Bits();
        for (int j = 0; j < h; j++)
        {
            var col = GetColumn(j, c.F[j]);
            for (int i = 0; i < v; i++) w[i * h + j] = col.Q[i];
            units.Add(new HiddenUnitPlan
            {
                FractionBits = c.F[j],
                WeightFormat = new QFormat(wbits, c.F[j]),
                AccumulatorFormat = new QFormat(abits, c.F[j]),
                Bias = col.Bias,
                TableShift = c.Table.IndexShift(c.F[j]),
                TableLimit = (long)c.Table.Limit(c.F[j]),
                EnergyShift = c.F[j] - e,
                Accumulator = new IntRange(col.Bias + col.Neg, col.Bias + col.Pos),
                Input = _real.Hidden[j],
                InputError = col.Delta,
                Error = c.UnitError[j],
            });
        }
        var lat = GetLateral(c.LateralF);
        var links = _m.VisibleLinks.Select((l, k) => new QLink(l.I, l.J, lat.Q[k])).ToImmutableArray();
        var hlinks = _m.HiddenLinks.Select((l, k) => new QLink(l.I, l.J, c.HiddenLinks[k])).ToImmutableArray();
        return new FixedPointPlan
        {
            Model = _m,
            Options = _o,
            Accumulator = c.Acc,
            AccumulatorReason = reason,
            EnergyFractionBits = e,
            EnergyOffset = c.Offset,
            Weights = w.ToImmutableArray(),
            Units = units.MoveToImmutable(),
            VisibleBias = c.VisibleBias.ToImmutableArray(),
            LateralFractionBits = c.LateralF,
            Lateral = links,
            HiddenLinks = hlinks,
            Table = c.Table,
            Ranges = _real,
            Checks = c.Checks.ToImmutableArray(),
            Error = c.Budget,
        };
    }
}
