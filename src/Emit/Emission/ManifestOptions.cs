using Emit.Detection;
using Emit.Quantize;

namespace Emit.Emission;

/// <summary>
/// The <c>options</c> object of a manifest (docs/manifest.md): every compile option, shared by the manifests of a
/// scorer and of a classifier.
/// </summary>
internal sealed record ManifestOptions(
    IReadOnlyList<string> Targets,
    NumericMode Numeric,
    string Name,
    string Namespace,
    int SelfTestVectors,
    OptimizeFor Optimize,
    bool Stream,
    bool Explain,
    bool CustomTemplates,
    FixedPointOptions? Fixed,
    AlarmFilterSpec? AlarmFilter);
