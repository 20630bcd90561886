namespace Emit.Quantize;

/// <summary>
/// Outcome of <see cref="AdversarialSearch"/>: the stated bound and the largest |error| found (nats).
/// </summary>
public sealed record AdversarialResult(double Bound, double LargestError, byte[] Vector, int Evaluations)
{
    /// <summary>Bound / largest error found (≥ 1 when the bound holds; close to 1 when it is tight).</summary>
    public double Ratio => LargestError > 0 ? Bound / LargestError : double.PositiveInfinity;
}
