namespace Emit.Training;

/// <summary>Where the negative phase's chains start.</summary>
public enum TrainingMethod
{
    /// <summary>
    /// Contrastive divergence CD-k: each chain starts at a training row and runs k Gibbs steps (Hinton 2002).
    /// </summary>
    Cd,

    /// <summary>
    /// Persistent contrastive divergence: one chain per batch slot carries on from update to update (Tieleman 2008).
    /// </summary>
    Pcd,
}
