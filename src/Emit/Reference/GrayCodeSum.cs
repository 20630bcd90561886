using System.Numerics;

namespace Emit.Reference;

/// <summary>
/// log Σ_s exp(score(s)) over all s ∈ {0,1}^n (n &lt;= 32), where
/// score(s) = a·s + Σ_{k&lt;l} J_kl s_k s_l + Σ_j softplus(c_j + Σ_k s_k U_kj).
/// The second layer (c, U) is summed out in closed form; it may be empty. States are visited in Gray-code
/// order so each step flips one unit: O(n + m) work instead of O(n·m). Work is split into fixed blocks
/// of consecutive Gray indices; each block starts from a freshly computed state (which also bounds
/// floating-point drift of the running sums) and the block results are combined in index order, so the
/// result has the same bits for any number of threads.
/// </summary>
internal sealed class GrayCodeSum
{
    private readonly int _n;
    private readonly int _m;
    private readonly double[] _a;
    private readonly double[]? _j;  // n×n symmetric, zero diagonal, or null when there are no pair terms
    private readonly double[] _u;   // n×m row-major
    private readonly double[] _c;   // m

    /// <summary>Log2 of the states per block.</summary>
    public const int BlockBits = 14;

    public GrayCodeSum(double[] a, double[]? pairs, double[] rows, double[] otherBias)
    {
        _n = a.Length;
        if (_n > 32) throw new ArgumentOutOfRangeException(nameof(a), "at most 32 enumerated units");
        _m = otherBias.Length;
        _a = a;
        _j = pairs;
        _u = rows;
        _c = otherBias;
        if (rows.Length != _n * _m) throw new ArgumentException("rows must be n×m", nameof(rows));
        if (pairs is not null && pairs.Length != _n * _n)
            throw new ArgumentException("pairs must be n×n", nameof(pairs));
    }

    public long States => 1L << _n;

    public long Blocks => Math.Max(1, States >> BlockBits);

    public long BlockSize => States / Blocks;

    /// <summary>log Σ exp(score) over all states, in parallel over blocks.</summary>
    public double LogSumExp(bool parallel = true, IProgress<long>? progress = null, CancellationToken cancel = default)
    {
        long blocks = Blocks, size = BlockSize;
        var parts = new LogSumExpAccumulator[blocks];
        if (parallel && blocks > 1)
        {
            long done = 0;
            Parallel.For(0L, blocks, new ParallelOptions { CancellationToken = cancel }, () => new Scratch(_n, _m),
                (b, _, scratch) =>
            {
                parts[b] = Block(b * size, size, scratch);
                if (progress is not null) progress.Report(Interlocked.Add(ref done, size));
                return scratch;
            }, _ => { });
        }
        else
        {
            var scratch = new Scratch(_n, _m);
            for (long b = 0; b < blocks; b++)
            {
                cancel.ThrowIfCancellationRequested();
                parts[b] = Block(b * size, size, scratch);
                progress?.Report((b + 1) * size);
            }
        }
        var total = LogSumExpAccumulator.Empty;
        for (long b = 0; b < blocks; b++) total.Add(parts[b]);
        return total.Value;
    }

    /// <summary>Runs the given number of blocks from the start, for a time estimate.</summary>
    internal void Sample(int blocks)
    {
        var scratch = new Scratch(_n, _m);
        for (int b = 0; b < Math.Min(blocks, Blocks); b++) Block(b * BlockSize, BlockSize, scratch);
    }

    private sealed class Scratch(int n, int m)
    {
        public readonly double[] Field = new double[n];
        public readonly double[] Acc = new double[m];
        public readonly bool[] S = new bool[n];
    }

    private LogSumExpAccumulator Block(long start, long count, Scratch w)
    {
        int n = _n, m = _m;
        var s = w.S;
        var field = w.Field;
        var acc = w.Acc;
        ulong g = (ulong)start ^ ((ulong)start >> 1);
        for (int k = 0; k < n; k++) s[k] = ((g >> k) & 1) != 0;
        // Fresh state: field_k = a_k + Σ_l J_kl s_l, acc = c + Σ_{k on} U_k, quad = Σ_k s_k (a_k + ½ Σ_l J_kl s_l).
        double quad = 0;
        for (int k = 0; k < n; k++)
        {
            double f = _a[k];
            if (_j is not null)
                for (int l = 0; l < n; l++)
                    if (s[l]) f += _j[k * n + l];
            field[k] = f;
        }
        for (int k = 0; k < n; k++)
            if (s[k]) quad += 0.5 * (field[k] + _a[k]);
        _c.AsSpan().CopyTo(acc);
        for (int k = 0; k < n; k++)
            if (s[k]) Add(acc, _u.AsSpan(k * m, m), 1.0);

        var result = LogSumExpAccumulator.Empty;
        for (long t = 0; ; t++)
        {
            double score = quad;
            for (int j = 0; j < m; j++) score += Softplus.Of(acc[j]);
            result.Add(score);
            if (t == count - 1) break;
            int k = BitOperations.TrailingZeroCount((ulong)(start + t + 1));
            double sign = s[k] ? -1.0 : 1.0;
            if (s[k]) quad -= field[k];
            else quad += field[k];
            s[k] = !s[k];
            if (m > 0) Add(acc, _u.AsSpan(k * m, m), sign);
            if (_j is not null)
                for (int l = 0; l < n; l++) field[l] += sign * _j[l * n + k];
        }
        return result;
    }

    private static void Add(Span<double> acc, ReadOnlySpan<double> row, double sign)
    {
        int i = 0;
        if (Vector.IsHardwareAccelerated && acc.Length >= Vector<double>.Count)
        {
            var vs = new Vector<double>(sign);
            for (; i <= acc.Length - Vector<double>.Count; i += Vector<double>.Count)
                (new Vector<double>(acc[i..]) + vs * new Vector<double>(row[i..])).CopyTo(acc[i..]);
        }
        for (; i < acc.Length; i++) acc[i] += sign * row[i];
    }
}
