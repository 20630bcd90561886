namespace Emit.Demo;

/// <summary>
/// One normal operating mode of the demo fleet: how often it occurs (relative integer weight) and the recipe
/// that draws a status report in that mode.
/// </summary>
public sealed class ReeferMode
{
    private readonly Action<FlagVector> _fill;

    internal ReeferMode(string name, int weight, string description, Action<FlagVector> fill)
    {
        Name = name;
        Weight = weight;
        Description = description;
        _fill = fill;
    }

    /// <summary>snake_case name, e.g. <c>steady_frozen</c>.</summary>
    public string Name { get; }

    /// <summary>Relative frequency among normal reports (an integer so the choice is exact).</summary>
    public int Weight { get; }

    /// <summary>One sentence for people.</summary>
    public string Description { get; }

    /// <summary>Draws the flags of a report in this mode into an all-off vector.</summary>
    internal void Fill(FlagVector v) => _fill(v);
}
