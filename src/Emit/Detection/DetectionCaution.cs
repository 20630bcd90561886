namespace Emit.Detection;

/// <summary>The caution every calibration output carries (text, JSON, plot), worded as elsewhere in emit.</summary>
public static class DetectionCaution
{
    /// <summary>The caution printed with every threshold and detection result.</summary>
    public const string Text =
        "a monitoring aid, not a safety function or protective interlock: a threshold calibrated on past data says " +
        "how " +
        "often normal operation crossed it then, not that a fault will be caught; defer to local codes and licensed " +
        "practice.";
}
