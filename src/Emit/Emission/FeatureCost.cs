namespace Emit.Emission;

/// <summary>
/// The extra cost of one firmware feature emitted beside the scorer, on the mode's reference core
/// (<see cref="FootprintModel"/>): code bytes added to flash, and RAM bytes of the state the caller owns.
/// </summary>
/// <param name="FlashBytes">Code bytes of the feature's functions (included in the scorer's flash figure).</param>
/// <param name="RamBytes">Bytes of the feature's state type, one instance (the caller's RAM, not the stack).</param>
public sealed record FeatureCost(int FlashBytes, int RamBytes);
