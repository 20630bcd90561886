using System.Collections.Immutable;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;
using Emit.Model;

namespace Emit.Training;

/// <summary>
/// The trainer's working copy of a model: W (visible × hidden, row-major) and its transpose, biases, and dense
/// symmetric link matrices with zero diagonals (visible × visible for kinds lateral and general, hidden × hidden for
/// general). Energy convention as <see cref="BoltzmannModel"/>.
/// </summary>
internal sealed class Parameters
{
    public Parameters(int visible, int hidden, bool visibleLinks, bool hiddenLinks)
    {
        Visible = visible;
        Hidden = hidden;
        W = new double[visible * hidden];
        WT = new double[hidden * visible];
        B = new double[visible];
        C = new double[hidden];
        L = visibleLinks ? new double[visible * visible] : null;
        M = hiddenLinks ? new double[hidden * hidden] : null;
    }

    public int Visible { get; }
    public int Hidden { get; }
    public double[] W { get; }
    public double[] WT { get; }
    public double[] B { get; }
    public double[] C { get; }
    public double[]? L { get; }
    public double[]? M { get; }

    /// <summary>
    /// Rows of <see cref="WT"/> per block of <see cref="Transpose(int)"/>, and the tile side inside one.
    /// </summary>
    public const int TransposeTile = 16;

    /// <summary>
    /// Number of blocks <see cref="Transpose(int)"/> takes to cover a transpose with <paramref name="hidden"/> rows.
    /// </summary>
    public static int TransposeBlocks(int hidden) => (hidden + TransposeTile - 1) / TransposeTile;

    /// <summary>Rewrites <see cref="WT"/> from <see cref="W"/>.</summary>
    public void Transpose()
    {
        for (int b = 0; b < TransposeBlocks(Hidden); b++) Transpose(b);
    }

    /// <summary>
    /// Rewrites rows [16 b, 16 b + 16) of <see cref="WT"/> from <see cref="W"/>, in 16 × 16 tiles so both matrices
    /// are read and written a cache line at a time; blocks write disjoint rows, so they may run on different threads.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Transpose(int block)
    {
        int nv = Visible, nh = Hidden;
        int j0 = block * TransposeTile, j1 = Math.Min(nh, j0 + TransposeTile);
        for (int i0 = 0; i0 < nv; i0 += TransposeTile)
        {
            int i1 = Math.Min(nv, i0 + TransposeTile);
            if (Avx512F.IsSupported && i1 - i0 == TransposeTile && j1 - j0 == TransposeTile)
            {
                for (int i = i0; i < i1; i += 8)
                    for (int j = j0; j < j1; j += 8) Transpose8(W, i * nh + j, nh, WT, j * nv + i, nv);
                continue;
            }
            for (int i = i0; i < i1; i++)
                for (int j = j0; j < j1; j++) WT[j * nv + i] = W[i * nh + j];
        }
    }

    /// <summary>
    /// Copies the 8 × 8 block of <paramref name="src"/> at <paramref name="s"/> (rows <paramref name="sRow"/> apart)
    /// transposed to <paramref name="dst"/> at <paramref name="d"/> (rows <paramref name="dRow"/> apart), in registers:
    /// three rounds of two-source lane permutations (pairs of elements, then pairs of pairs, then halves), each
    /// output row one eight-lane store instead of eight scattered ones. Only copies, so the values are unchanged.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Transpose8(double[] src, int s, int sRow, double[] dst, int d, int dRow)
    {
        Vector512<double> R(int k) => Vector512.Create(new ReadOnlySpan<double>(src, s + k * sRow, 8));
        static Vector512<double> P(Vector512<double> a, Vector512<long> index, Vector512<double> b) =>
            Avx512F.PermuteVar8x64x2(a, index, b);
        // Lane k of index picks a[k] for k < 8, b[k - 8] otherwise.
        var even = Vector512.Create(0L, 8, 2, 10, 4, 12, 6, 14);
        var odd = Vector512.Create(1L, 9, 3, 11, 5, 13, 7, 15);
        var pairLow = Vector512.Create(0L, 1, 8, 9, 4, 5, 12, 13);
        var pairHigh = Vector512.Create(2L, 3, 10, 11, 6, 7, 14, 15);
        var halfLow = Vector512.Create(0L, 1, 2, 3, 8, 9, 10, 11);
        var halfHigh = Vector512.Create(4L, 5, 6, 7, 12, 13, 14, 15);
        Vector512<double> r0 = R(0), r1 = R(1), r2 = R(2), r3 = R(3), r4 = R(4), r5 = R(5), r6 = R(6), r7 = R(7);
        // a0 = r0[0] r1[0] r0[2] r1[2] r0[4] r1[4] r0[6] r1[6]; a1 the odd columns; likewise for rows 2–3, 4–5, 6–7.
        Vector512<double> a0 = P(r0, even, r1), a1 = P(r0, odd, r1), a2 = P(r2, even, r3), a3 = P(r2, odd, r3);
        Vector512<double> a4 = P(r4, even, r5), a5 = P(r4, odd, r5), a6 = P(r6, even, r7), a7 = P(r6, odd, r7);
        // b0 = rows 0–3 of columns 0 and 4; b1 of 1 and 5; b2 of 2 and 6; b3 of 3 and 7; b4–b7 the same for rows 4–7.
        Vector512<double> b0 = P(a0, pairLow, a2), b2 = P(a0, pairHigh, a2), b1 = P(a1, pairLow, a3);
        Vector512<double> b3 = P(a1, pairHigh, a3), b4 = P(a4, pairLow, a6), b6 = P(a4, pairHigh, a6);
        Vector512<double> b5 = P(a5, pairLow, a7), b7 = P(a5, pairHigh, a7);
        P(b0, halfLow, b4).CopyTo(dst.AsSpan(d, 8));
        P(b1, halfLow, b5).CopyTo(dst.AsSpan(d + dRow, 8));
        P(b2, halfLow, b6).CopyTo(dst.AsSpan(d + 2 * dRow, 8));
        P(b3, halfLow, b7).CopyTo(dst.AsSpan(d + 3 * dRow, 8));
        P(b0, halfHigh, b4).CopyTo(dst.AsSpan(d + 4 * dRow, 8));
        P(b1, halfHigh, b5).CopyTo(dst.AsSpan(d + 5 * dRow, 8));
        P(b2, halfHigh, b6).CopyTo(dst.AsSpan(d + 6 * dRow, 8));
        P(b3, halfHigh, b7).CopyTo(dst.AsSpan(d + 7 * dRow, 8));
    }

    public void CopyTo(Parameters other)
    {
        W.CopyTo(other.W, 0);
        WT.CopyTo(other.WT, 0);
        B.CopyTo(other.B, 0);
        C.CopyTo(other.C, 0);
        L?.CopyTo(other.L!, 0);
        M?.CopyTo(other.M!, 0);
    }

    public Parameters Clone()
    {
        var p = new Parameters(Visible, Hidden, L is not null, M is not null);
        CopyTo(p);
        return p;
    }

    /// <summary>The model these parameters define (links with |w| = 0 are left out).</summary>
    public BoltzmannModel ToModel(ModelKind kind, ImmutableArray<string> names, string? metadataJson = null)
    {
        return new BoltzmannModel(kind, Visible, Hidden, ImmutableArray.Create(B), ImmutableArray.Create(C),
            ImmutableArray.Create(W),
            Links(L, Visible), Links(M, Hidden), names, metadataJson: metadataJson);
    }

    private static ImmutableArray<Link> Links(double[]? pairs, int n)
    {
        if (pairs is null) return ImmutableArray<Link>.Empty;
        var b = ImmutableArray.CreateBuilder<Link>();
        for (int i = 0; i < n; i++)
            for (int j = i + 1; j < n; j++)
                if (pairs[i * n + j] != 0) b.Add(new Link(i, j, pairs[i * n + j]));
        return b.ToImmutable();
    }

    /// <summary>Parameters of an existing model (for the sampler tests and for continuing from a model).</summary>
    public static Parameters From(BoltzmannModel m)
    {
        var p = new Parameters(m.Visible, m.Hidden, m.Kind != ModelKind.Rbm, m.Kind == ModelKind.General);
        m.Weights.CopyTo(p.W);
        m.VisibleBias.CopyTo(p.B);
        m.HiddenBias.CopyTo(p.C);
        foreach (var l in m.VisibleLinks) { p.L![l.I * m.Visible + l.J] = l.W; p.L[l.J * m.Visible + l.I] = l.W; }
        foreach (var l in m.HiddenLinks) { p.M![l.I * m.Hidden + l.J] = l.W; p.M[l.J * m.Hidden + l.I] = l.W; }
        p.Transpose();
        return p;
    }
}
