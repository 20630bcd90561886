using System.Collections.Immutable;
using Emit.Training;

namespace Emit.Demo;

/// <summary>
/// One status report being built: a 0/1 value per <see cref="ReeferFlag"/> and the generator drawing it.
/// </summary>
public sealed class FlagVector
{
    private readonly byte[] _bits = new byte[ReeferFlags.Count];

    internal FlagVector(SplitMix64 rng) => Rng = rng;

    /// <summary>The random stream recipes draw from.</summary>
    public SplitMix64 Rng { get; }

    /// <summary>Whether <paramref name="flag"/> is on.</summary>
    public bool this[ReeferFlag flag]
    {
        get => _bits[(int)flag] != 0;
        set => _bits[(int)flag] = value ? (byte)1 : (byte)0;
    }

    /// <summary>
    /// Sets <paramref name="flag"/> on with probability <paramref name="p"/> (off otherwise); returns the value.
    /// </summary>
    public bool Draw(ReeferFlag flag, double p) => this[flag] = Rng.Chance(p);

    /// <summary>Turns every listed flag off.</summary>
    public void Clear(params ReadOnlySpan<ReeferFlag> flags)
    {
        foreach (var f in flags) this[f] = false;
    }

    /// <summary>A copy of the 0/1 values in column order.</summary>
    public ImmutableArray<byte> ToImmutable() => ImmutableArray.Create(_bits);
}
