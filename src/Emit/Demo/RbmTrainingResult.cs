using System.Collections.Immutable;
using Emit.Model;

namespace Emit.Demo;

/// <summary>A trained RBM (no threshold, no metadata yet) and its mean squared reconstruction error after each epoch.</summary>
public sealed record RbmTrainingResult(BoltzmannModel Model, ImmutableArray<double> ReconstructionError);
