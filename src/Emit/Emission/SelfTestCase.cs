namespace Emit.Emission;

/// <summary>
/// One embedded self-test vector: the input, the reference free energy, and the tolerance the generated code
/// allows (already rounded up to the mode). In fixed mode <see cref="ExactExpected"/> is the integer the generated
/// code must return exactly (from <see cref="Emit.Quantize.FixedPointSimulator"/>); <see cref="Expected"/> is then
/// that integer in nats and <see cref="Tolerance"/> is 0.
/// </summary>
public sealed record SelfTestCase(byte[] Units, byte[] Packed, double Expected, double Tolerance, string Label,
    long? ExactExpected = null);
