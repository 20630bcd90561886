namespace Emit.Quantize;

/// <summary>
/// A quantized link of integer weight <see cref="W"/> between units <see cref="I"/> &lt; <see cref="J"/> of one layer.
/// </summary>
public readonly record struct QLink(int I, int J, long W);
