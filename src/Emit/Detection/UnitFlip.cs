namespace Emit.Detection;

/// <summary>
/// Flipping visible unit <see cref="Unit"/> changes the free energy by <see cref="DeltaFreeEnergy"/> = F(v with the
/// unit flipped) − F(v).
/// </summary>
public readonly record struct UnitFlip(int Unit, double DeltaFreeEnergy);
