namespace Emit.Detection;

/// <summary>Where a calibration's inputs came from, for its text and JSON reports.</summary>
/// <param name="ModelName">The model file's name.</param>
/// <param name="CalibratedSha256">The identity of the model with the new threshold.</param>
/// <param name="NormalName">The normal data file's name.</param>
/// <param name="NormalSha256">SHA-256 of the normal data file's bytes.</param>
/// <param name="AnomaliesName">The anomaly data file's name, or null.</param>
public sealed record CalibrationSource(string ModelName, string CalibratedSha256, string NormalName,
    string NormalSha256, string? AnomaliesName);
