using Emit.Model;

namespace Emit.Training;

/// <summary>
/// One batch slot: its random stream, its persistent chain state (v, h) and scratch space. Slot k handles the
/// k-th row of every batch and the k-th persistent chain, whichever thread runs it, so results do not depend on
/// threads.
/// </summary>
internal sealed class Slot
{
    public Slot(int visible, int hidden, ModelKind kind, ulong seed)
    {
        Rng = new SplitMix64(seed);
        V = new byte[visible];
        H = new byte[hidden];
        A = new double[hidden];
        Field = new double[visible];
        HiddenField = new double[hidden];
        if (kind == ModelKind.General) Table = new double[1 << hidden];
    }

    public SplitMix64 Rng { get; }

    /// <summary>Chain state: visible units.</summary>
    public byte[] V { get; }

    /// <summary>Chain state: hidden units.</summary>
    public byte[] H { get; }

    /// <summary>Hidden inputs c + vW.</summary>
    public double[] A { get; }

    /// <summary>Visible inputs b + W h (+ L v).</summary>
    public double[] Field { get; }

    /// <summary>Hidden-hidden inputs M h (general).</summary>
    public double[] HiddenField { get; }

    /// <summary>Unnormalised posterior weights of the 2^hidden states (general), indexed by the state's bits.</summary>
    public double[]? Table { get; }

    /// <summary>Sum of <see cref="Table"/> after the last posterior.</summary>
    public double Total { get; set; }
}
