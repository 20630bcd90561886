using Emit.Model;

namespace Emit.Detection;

/// <summary>A calibration with everything needed to report it and to store it.</summary>
/// <param name="Report">The threshold and its figures.</param>
/// <param name="Model">The model with the threshold set and <c>metadata.calibration</c> recorded.</param>
/// <param name="Source">Names and hashes for the text and JSON reports.</param>
public sealed record CalibrationOutcome(CalibrationReport Report, BoltzmannModel Model, CalibrationSource Source)
{
    /// <summary>The text report.</summary>
    public void WriteText(TextWriter output) => CalibrationText.Write(output, Report, Source);

    /// <summary>The JSON report (one object).</summary>
    public void WriteJson(System.Text.Json.Utf8JsonWriter output) => CalibrationJson.Write(output, Report, Source);
}
