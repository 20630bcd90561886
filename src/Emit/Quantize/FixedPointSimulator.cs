using System.Numerics;
using Emit.Model;

namespace Emit.Quantize;

/// <summary>
/// Bit-exact model of the generated fixed-point scorer: it performs, operation for operation, the integer
/// arithmetic the emitted C and C# perform, and returns the same integer energy. Real free energy =
/// result / <see cref="Scale"/> (= 2^E). Every operation is range-checked against the accumulator type
/// (|value| ≤ 2^(bits−1) − 1); a violation throws <see cref="OverflowException"/>, which would mean the plan's
/// proof is wrong. Right shifts are applied only to non-negative values (checked too).
/// <para>The arithmetic (acc_t = accumulator type; all operations in acc_t, operands widened first):</para>
/// <list type="number">
/// <item>Start: a_j = C_j for every hidden unit j; energy = K; lateral = 0.</item>
/// <item>For each visible unit i that is on, in increasing i (packed input: bytes in order, lowest set bit first):
/// energy += bq_i; a_j += w[i][j] for j = 0..H−1 (one contiguous row per visible unit); then for each lateral
/// link (k, i) with k &lt; i in increasing k: if unit k is on, lateral += l_ki.</item>
/// <item>energy += to_energy(lateral, s_L) (only when the model has lateral links).</item>
/// <item>rbm/lateral: for j = 0..H−1: energy += softplus_q(a_j; P_j, d_j, s_j).
/// general: z_j = to_energy(a_j, s_j); energy += lse_q(z) (below).</item>
/// <item>Result: −energy.</item>
/// </list>
/// <para>to_energy(x, s): s &gt; 0: x ≥ 0 ? (x + 2^(s−1)) &gt;&gt; s : −((−x + 2^(s−1)) &gt;&gt; s) (round half away
/// from zero); s ≤ 0: x · 2^(−s).</para>
/// <para>G_q(m; P, d) for a magnitude m ≥ 0 (table T non-increasing): if m ≥ P: 0. Else k = m &gt;&gt; d,
/// r = m &amp; (2^d − 1); d = 0: T[k]; d &gt; 0: T[k+1] + (((T[k] − T[k+1])·(2^d − r) + 2^(d−1)) &gt;&gt; d), the
/// linear interpolation T[k] + (T[k+1] − T[k])·r/2^d rounded half up, computed from non-negative terms only.</para>
/// <para>softplus_q(a; P, d, s) = (a &gt; 0 ? to_energy(a, s) : 0) + G_q(|a|; P, d), |a| = a ≥ 0 ? a : −a.</para>
/// <para>lse_q (general): visit the hidden states h in Gray-code order t = 0..2^H−1 (state t = t ^ (t &gt;&gt; 1)),
/// starting from all off with score s = 0 and field_k = z_k. Step t ≥ 1 flips unit k = number of trailing zero
/// bits of t: if h_k was off, s += field_k and field_l += M_lk for every l ≠ k; if on, s −= field_k and
/// field_l −= M_lk. After the score of state t is known it is merged into a stack of H + 1 partial results like a
/// binary counter: v = s; for (lvl = 0; bit lvl of t is 1; lvl++) v = lse2(stack[lvl], v); stack[lvl] = v.
/// The result is stack[H]. lse2(a, b): m = a ≥ b ? a : b, dd = a ≥ b ? a − b : b − a, result m + G_q(dd; P_E,
/// d_E).</para>
/// </summary>
public sealed class FixedPointSimulator
{
    private readonly FixedPointPlan _plan;
    private readonly long _lim;
    private readonly int _v, _h;
    private readonly long[] _w, _bias, _bq, _tableLimit, _t;
    private readonly int[] _tableShift, _energyShift;
    private readonly (int Other, long W)[][] _lateral;  // per unit i: links (k, l_ki), k < i, increasing k
    private readonly long[] _m;                          // general: H×H symmetric
    private readonly int _lateralShift;

    /// <summary>Prepares a simulator for a plan.</summary>
    public FixedPointSimulator(FixedPointPlan plan)
    {
        _plan = plan;
        _lim = plan.Accumulator.MaxMagnitude();
        _v = plan.Model.Visible;
        _h = plan.Model.Hidden;
        _w = plan.Weights.ToArray();
        _bias = plan.Units.Select(u => u.Bias).ToArray();
        _bq = plan.VisibleBias.ToArray();
        _tableLimit = plan.Units.Select(u => u.TableLimit).ToArray();
        _tableShift = plan.Units.Select(u => u.TableShift).ToArray();
        _energyShift = plan.Units.Select(u => u.EnergyShift).ToArray();
        _t = plan.Table.Entries.ToArray();
        var lists = new List<(int, long)>[_v];
        foreach (var l in plan.Lateral) (lists[l.J] ??= new()).Add((l.I, l.W));
        _lateral = lists.Select(x => x?.OrderBy(p => p.Item1).ToArray() ?? []).ToArray();
        _lateralShift = plan.LateralShift;
        _m = new long[_h * _h];
        foreach (var l in plan.HiddenLinks)
        {
            _m[l.I * _h + l.J] = l.W;
            _m[l.J * _h + l.I] = l.W;
        }
    }

    /// <summary>The plan simulated.</summary>
    public FixedPointPlan Plan => _plan;

    /// <summary>2^E: real free energy = integer result / Scale.</summary>
    public double Scale => _plan.EnergyScale;

    /// <summary>
    /// Optional observer of every checked intermediate: (name, hidden unit or −1, value). Names match the
    /// plan's <see cref="FixedPointPlan.Checks"/> ("hidden[j]." + name for unit values). For tests.
    /// </summary>
    internal Action<string, int, long>? Observe { get; set; }

    /// <summary>The integer free energy for one byte per visible unit (nonzero = on).</summary>
    public long FreeEnergy(ReadOnlySpan<byte> units)
    {
        if (units.Length != _v) throw new ArgumentException($"expected {_v} units, got {units.Length}", nameof(units));
        var mask = new bool[_v];
        var on = new List<int>();
        for (int i = 0; i < _v; i++)
            if (units[i] != 0)
            {
                mask[i] = true;
                on.Add(i);
            }
        return Run(on, mask);
    }

    /// <summary>
    /// The integer free energy for packed bits: bit i = (packed[i &gt;&gt; 3] &gt;&gt; (i &amp; 7)) &amp; 1; bits past
    /// the last unit are ignored.
    /// </summary>
    public long FreeEnergyPacked(ReadOnlySpan<byte> packed)
    {
        int bytes = (_v + 7) / 8;
        if (packed.Length != bytes)
            throw new ArgumentException($"expected {bytes} packed bytes, got {packed.Length}", nameof(packed));
        var mask = new bool[_v];
        var on = new List<int>();
        for (int b = 0; b < bytes; b++)
        {
            uint bits = packed[b];
            while (bits != 0)
            {
                int i = 8 * b + BitOperations.TrailingZeroCount(bits);
                bits &= bits - 1;
                if (i < _v)
                {
                    mask[i] = true;
                    on.Add(i);
                }
            }
        }
        return Run(on, mask);
    }

    /// <summary>Real free energy in nats: <see cref="FreeEnergy"/> / <see cref="Scale"/>.</summary>
    public double FreeEnergyReal(ReadOnlySpan<byte> units) => FreeEnergy(units) / Scale;

    private long Chk(long x, string name, int unit = -1)
    {
        if (x > _lim || x < -_lim) throw new OverflowException($"{name} = {x} is outside ±{_lim}");
        Observe?.Invoke(name, unit, x);
        return x;
    }

    private long Add(long a, long b, string name, int unit = -1) => Chk(checked(a + b), name, unit);

    private long Mul(long a, long b, string name, int unit = -1) => Chk(checked(a * b), name, unit);

    private static long Shr(long x, int s) =>
        x >= 0 ? x >> s : throw new InvalidOperationException("right shift of a negative value");

    /// <summary>
    /// to_energy(x, s); the intermediate (|x| + half, or x · 2^−s) is checked under <paramref name="name"/>.
    /// </summary>
    internal long ToEnergy(long x, int s, string name, int unit = -1)
    {
        if (s <= 0) return Mul(x, 1L << -s, name, unit);
        long half = 1L << (s - 1);
        if (x >= 0) return Shr(Add(x, half, name, unit), s);
        long neg = Chk(checked(-x), name, unit);
        return -Shr(Add(neg, half, name, unit), s);
    }

    /// <summary>G_q(m) for a magnitude m ≥ 0 at index shift d, limit P = N·2^d.</summary>
    internal long GQ(long m, long p, int d, string prefix, int unit = -1)
    {
        if (m < 0) throw new InvalidOperationException("table lookup of a negative magnitude");
        if (m >= p) return 0;
        int k = (int)Shr(m, d);
        long t0 = _t[k];
        if (d == 0) return t0;
        long r = m & ((1L << d) - 1);
        long t1 = _t[k + 1];
        long prod = Add(Mul(t0 - t1, (1L << d) - r, prefix + "interpolation_product", unit), 1L << (d - 1),
            prefix + "interpolation_product", unit);
        return t1 + Shr(prod, d);
    }

    /// <summary>softplus_q(a) = (a &gt; 0 ? to_energy(a, s) : 0) + G_q(|a|) for hidden unit j.</summary>
    internal long SoftplusQ(long a, int j)
    {
        long m = a >= 0 ? a : checked(-a);
        long pos = a > 0 ? ToEnergy(a, _energyShift[j], "to_energy", j) : 0;
        return Chk(pos + GQ(m, _tableLimit[j], _tableShift[j], "", j), "softplus", j);
    }

    private long Run(List<int> on, bool[] isOn)
    {
        int h = _h;
        Span<long> acc = h <= 1024 ? stackalloc long[h] : new long[h];
        for (int j = 0; j < h; j++) acc[j] = Chk(_bias[j], "accumulator", j);
        long energy = Chk(_plan.EnergyOffset, "energy.linear");
        long lateral = 0;
        foreach (int i in on)
        {
            energy = Add(energy, _bq[i], "energy.linear");
            int row = i * h;
            for (int j = 0; j < h; j++) acc[j] = Add(acc[j], _w[row + j], "accumulator", j);
            foreach (var (other, w) in _lateral[i])
                if (isOn[other]) lateral = Add(lateral, w, "lateral.accumulator");
        }
        if (_plan.Lateral.Length > 0)
            energy = Add(energy, ToEnergy(lateral, _lateralShift, "lateral.to_energy"), "energy.base");
        if (_plan.Model.Kind != ModelKind.General)
        {
            for (int j = 0; j < h; j++) energy = Add(energy, SoftplusQ(acc[j], j), "energy.sum");
        }
        else
        {
            energy = Add(energy, LogSumExp(acc), "energy.sum");
        }
        return Chk(checked(-energy), "energy.result");
    }

    private long LogSumExp(ReadOnlySpan<long> acc)
    {
        int h = _h;
        var field = new long[h];
        var state = new bool[h];
        for (int j = 0; j < h; j++) field[j] = Chk(ToEnergy(acc[j], _energyShift[j], "to_energy", j), "score_term", j);
        var stack = new long[h + 1];
        long pe = _plan.LseTableLimit;
        int de = _plan.LseTableShift;
        long score = 0;
        long total = 1L << h;
        for (long t = 0; t < total; t++)
        {
            if (t > 0)
            {
                int k = BitOperations.TrailingZeroCount((ulong)t);
                bool up = !state[k];
                score = up ? Add(score, field[k], "general.score") : Chk(checked(score - field[k]), "general.score");
                state[k] = up;
                for (int l = 0; l < h; l++)
                {
                    if (l == k) continue;
                    long mlk = _m[l * h + k];
                    field[l] = up ? Add(field[l], mlk, "field", l) : Chk(checked(field[l] - mlk), "field", l);
                }
            }
            long val = score;
            int lvl = 0;
            for (; ((t >> lvl) & 1) != 0; lvl++)
            {
                long a = stack[lvl];
                long m = a >= val ? a : val;
                long dd = a >= val ? Chk(checked(a - val), "general.difference")
                    : Chk(checked(val - a), "general.difference");
                val = Add(m, GQ(dd, pe, de, "general.lse."), "general.tree");
            }
            stack[lvl] = val;
        }
        return stack[h];
    }
}
