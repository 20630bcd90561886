using System.Collections.Immutable;
using System.Runtime.CompilerServices;
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
            for (int i = i0; i < i1; i++)
                for (int j = j0; j < j1; j++) WT[j * nv + i] = W[i * nh + j];
        }
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
