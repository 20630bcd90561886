namespace Emit.Emission;

/// <summary>One model of a classifier as its manifest records it (docs/manifest.md, "Classifier manifest").</summary>
/// <param name="File">The model's file name (no folder), as the banners show it.</param>
/// <param name="Sha256">The model's identity hash (docs/model-format.md).</param>
/// <param name="Kind">rbm, lateral or general.</param>
/// <param name="Visible">Visible units.</param>
/// <param name="Hidden">Hidden units.</param>
/// <param name="Scorer">The name of the model's scorer (NAME_k).</param>
/// <param name="Manifest">The file name of that scorer's manifest (NAME_k.emit.json).</param>
/// <param name="ManifestSha256">The SHA-256 of that manifest as written.</param>
/// <param name="LogZ">The model's stored log Z.</param>
/// <param name="LogPrior">log π_k, the prior normalised over the models.</param>
public sealed record ClassifierManifestModel(string File, string Sha256, string Kind, int Visible, int Hidden,
    string Scorer, string Manifest, string ManifestSha256, double LogZ, double LogPrior);
