using System.Collections.Immutable;
using Emit.Model;
using Emit.Reference;

namespace Emit.Quantize;

/// <summary>
/// The candidate search behind <see cref="FixedPointPlanner"/> (caches quantized columns and tables). Split by concern:
/// this file tries candidates and builds the winner; PlanSearch.UnitFormats.cs chooses each hidden unit's format and
/// checks its ranges, PlanSearch.LateralFormats.cs the lateral links' format, PlanSearch.ErrorBudget.cs encloses the
/// hidden-input error.
/// </summary>
internal sealed partial class PlanSearch
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
        double scale = 1 + _real.FreeEnergy.MaxAbs + _real.Hidden.Sum(r => r.MaxAbs) + _real.LateralTerm.MaxAbs +
            _real.HiddenLinkTerm.MaxAbs;
        _slack = 1e-12 * scale;
        double sp = 0;
        foreach (var r in _real.Hidden) sp += Math.Max(0, r.Max) + Math.Log(2);
        var linear = _real.VisibleBiasTerm + _real.LateralTerm;
        _energyMagnitude = Math.Max(Math.Abs(linear.Min), Math.Abs(linear.Max + sp));
        if (model.Kind == ModelKind.General) _energyMagnitude += _real.HiddenLinkTerm.MaxAbs;
    }

    private readonly double _energyMagnitude;

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
            for (int e = _o.EnergyFractionBitsLimit ?? FixedPointPlanner.MaxEnergyFractionBits; e >= 0; e--)
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
        if (!ChooseUnitFormats(table, lim, checks, named is not null, f, outRange, cols, ref reduced)) return null;

        if (!ChooseLateralFormat(e, lim, checks, ref reduced, out var lat, out int fl, out var latE)) return null;

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
        var sum = new IntRange(baseRange.Min + Int128.Min(0, hiddenOut.Min),
            baseRange.Max + Int128.Max(0, hiddenOut.Max));
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
