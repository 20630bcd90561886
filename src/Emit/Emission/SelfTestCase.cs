namespace Emit.Emission;

/// <summary>
/// One embedded self-test vector: the input, the reference free energy, and the tolerance the generated code
/// allows (already rounded up to the mode).
/// </summary>
public sealed record SelfTestCase(byte[] Units, byte[] Packed, double Expected, double Tolerance, string Label);
