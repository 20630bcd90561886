using System.Globalization;

namespace Emit.Harness;

/// <summary>The human-readable report: a table with one row per target, then the reasons for each failure.</summary>
public static class ReportText
{
    /// <summary>Writes <paramref name="report"/> as text for a terminal.</summary>
    public static void Write(VerifyReport report, TextWriter o)
    {
        var inv = CultureInfo.InvariantCulture;
        if (report.ClassifierModels.Count == 0)
            o.WriteLine(
                $"emit verify: {report.Model} (sha256 {report.ModelSha256[..16]}...), {report.Vectors} vectors from " +
                $"{report.Input}");
        else
            o.WriteLine(
                $"emit verify: classifier over {report.ClassifierModels.Count} models " +
                string.Join(", ", report.ClassifierModels.Select(m => $"{m.File} (sha256 {m.Sha256[..16]}...)")) +
                $", {report.Vectors} vectors from {report.Input}; the table is {report.Model}'s scorer, the " +
                "classify lines the classifier");
        foreach (var w in report.Warnings) o.WriteLine("warning: " + w);
        string[] head = ["target", "numeric", "weights", "vectors", "max |err|", "mean |err|", "bound", "bit-exact",
            "decisions", "unexplained", "s/vector", "verdict"];
        var rows = new List<string[]> { head };
        foreach (var t in report.Targets)
            rows.Add(
            [
                t.Target, t.Numeric, t.Weights, t.Vectors.ToString(inv),
                G(t.MaxAbsError), G(t.MeanAbsError), G(t.ErrorBound),
                t.BitExact is { } b ? (b ? "yes" : "NO") : "-",
                t.DecisionMismatches.ToString(inv), t.UnexplainedMismatches.ToString(inv),
                G(t.SecondsPerVector), t.Passed ? "pass" : "FAIL",
            ]);
        var widths = Enumerable.Range(0, head.Length).Select(c => rows.Max(r => r[c].Length)).ToArray();
        foreach (var r in rows)
            o.WriteLine(
                string.Join("  ",
                    r.Select((cell, c) => c == r.Length - 1 ? cell : cell.PadRight(widths[c]))).TrimEnd());
        foreach (var t in report.Targets)
        {
            foreach (var f in t.Features)
                o.WriteLine($"{t.Target} {f.Feature}: {f.Checks} checked, {f.Mismatches} mismatches " +
                            $"({f.Detail}) {(f.Passed ? "pass" : "FAIL")}");
        }
        foreach (var t in report.Targets)
        {
            if (t.Passed) continue;
            foreach (var f in t.Failures)
                o.WriteLine($"FAIL {t.Target}: {f.Replace("\n", "\n    ", StringComparison.Ordinal)}");
        }
        int failed = report.Targets.Count(t => !t.Passed);
        o.WriteLine(failed == 0
            ? report.Targets.Count == 1
                ? $"verify: target {report.Targets[0].Target} agrees with the reference within its bound"
                : $"verify: all {report.Targets.Count} targets agree with the reference within their bounds"
            : $"verify: {failed} of {report.Targets.Count} targets failed");
        o.WriteLine("bound: " + string.Join("; ", report.Targets.Select(t => t.ErrorBoundBasis).Distinct()));
        o.WriteLine("Caution: " + VerifyReport.Caution);
    }

    private static string G(double? x) =>
        x is { } v ? v.ToString("G3", CultureInfo.InvariantCulture).ToLowerInvariant() : "-";
}
