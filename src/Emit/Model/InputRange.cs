namespace Emit.Model;

/// <summary>The exact range of one hidden unit's input c_j + Σ_i v_i W_ij over all binary vectors v.</summary>
public readonly record struct InputRange(double Min, double Max);
