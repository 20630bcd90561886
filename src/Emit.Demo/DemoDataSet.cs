using System.Collections.Immutable;
using Emit.Model;

namespace Emit.Demo;

/// <summary>The demo model (threshold and metadata set) with the normal and faulty reports shipped beside it.</summary>
public sealed record DemoDataSet(
    BoltzmannModel Model,
    ImmutableArray<ReeferRow> Normal,
    ImmutableArray<ReeferRow> Faulty,
    ImmutableArray<double> ReconstructionError);
