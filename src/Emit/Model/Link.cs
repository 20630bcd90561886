namespace Emit.Model;

/// <summary>
/// A symmetric coupling of weight <see cref="W"/> between units <see cref="I"/> &lt; <see cref="J"/> of one layer.
/// </summary>
public readonly record struct Link(int I, int J, double W);
