using System.Collections.Immutable;

namespace Emit.Demo;

/// <summary>
/// One named fault of the demo fleet: a recipe that perturbs a normal report drawn from one of its base modes.
/// </summary>
public sealed class ReeferFault
{
    private readonly Action<FlagVector> _apply;

    internal ReeferFault(string name, string description, ImmutableArray<string> baseModes, Action<FlagVector> apply)
    {
        Name = name;
        Description = description;
        BaseModes = baseModes;
        _apply = apply;
    }

    /// <summary>snake_case name, e.g. <c>defrost_stuck</c>.</summary>
    public string Name { get; }

    /// <summary>One sentence for people.</summary>
    public string Description { get; }

    /// <summary>Names of the normal modes the fault starts from (chosen by their weights).</summary>
    public ImmutableArray<string> BaseModes { get; }

    /// <summary>Perturbs a normal report in place.</summary>
    internal void Apply(FlagVector v) => _apply(v);
}
