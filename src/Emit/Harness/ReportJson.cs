using System.Text.Json;

namespace Emit.Harness;

/// <summary>The JSON report (docs/verify-report.md describes every field).</summary>
public static class ReportJson
{
    /// <summary>Format version of the JSON report.</summary>
    public const int Format = 1;

    /// <summary>Writes <paramref name="report"/> as JSON (docs/verify-report.md).</summary>
    public static void Write(VerifyReport report, Utf8JsonWriter w)
    {
        w.WriteStartObject();
        w.WriteNumber("format", Format);
        w.WriteString("tool", "emit " + report.ToolVersion);
        w.WriteBoolean("passed", report.Passed);
        w.WriteString("model", report.Model);
        w.WriteString("model_sha256", report.ModelSha256);
        if (report.ClassifierModels.Count > 0)
        {
            w.WriteStartArray("classifier_models");
            foreach (var (file, sha) in report.ClassifierModels)
            {
                w.WriteStartObject();
                w.WriteString("model", file);
                w.WriteString("model_sha256", sha);
                w.WriteEndObject();
            }
            w.WriteEndArray();
        }
        w.WriteString("input", report.Input);
        w.WriteNumber("vectors", report.Vectors);
        Number(w, "threshold", report.Threshold);
        w.WriteBoolean("allow_model_change", report.AllowModelChange);
        w.WriteBoolean("fail_on_decision_mismatch", report.FailOnDecisionMismatch);
        w.WriteStartArray("warnings");
        foreach (var s in report.Warnings) w.WriteStringValue(s);
        w.WriteEndArray();
        w.WriteStartArray("targets");
        foreach (var t in report.Targets)
        {
            w.WriteStartObject();
            w.WriteString("target", t.Target);
            w.WriteString("numeric", t.Numeric);
            w.WriteString("weights", t.Weights);
            w.WriteNumber("vectors", t.Vectors);
            Number(w, "max_abs_error", t.MaxAbsError);
            Number(w, "mean_abs_error", t.MeanAbsError);
            if (t.WorstVector is { } worst) w.WriteNumber("worst_vector", worst); else w.WriteNull("worst_vector");
            Number(w, "error_bound", t.ErrorBound);
            w.WriteString("error_bound_basis", t.ErrorBoundBasis);
            if (t.BitExact is { } b) w.WriteBoolean("bit_exact", b); else w.WriteNull("bit_exact");
            if (t.BitMismatches is { } bm) w.WriteNumber("bit_mismatches", bm); else w.WriteNull("bit_mismatches");
            w.WriteNumber("decision_mismatches", t.DecisionMismatches);
            w.WriteNumber("unexplained_mismatches", t.UnexplainedMismatches);
            w.WriteNumber("entry_point_mismatches", t.EntryPointMismatches);
            if (t.SelfTestFailures is { } st)
                w.WriteNumber("selftest_failures", st); else w.WriteNull("selftest_failures");
            w.WriteString("sources", t.Sources);
            if (t.SourceModelSha256 is { } sha)
                w.WriteString("source_model_sha256", sha); else w.WriteNull("source_model_sha256");
            w.WriteBoolean("model_hash_matches", t.ModelHashMatches);
            if (t.Manifest is { } manifest) w.WriteString("manifest", manifest); else w.WriteNull("manifest");
            if (t.SourcesMatch is { } match) w.WriteBoolean("sources_match", match); else w.WriteNull("sources_match");
            w.WriteStartArray("edits");
            foreach (var e in t.Edits)
            {
                w.WriteStartObject();
                w.WriteString("file", e.File);
                if (e.Line is { } line) w.WriteNumber("line", line); else w.WriteNull("line");
                if (e.Expected is { } want) w.WriteString("expected", want); else w.WriteNull("expected");
                if (e.Found is { } found) w.WriteString("found", found); else w.WriteNull("found");
                w.WriteBoolean("matches_manifest", e.MatchesManifest);
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteBoolean("compared", t.Compared);
            w.WriteStartArray("features");
            foreach (var f in t.Features)
            {
                w.WriteStartObject();
                w.WriteString("feature", f.Feature);
                w.WriteNumber("checks", f.Checks);
                w.WriteNumber("mismatches", f.Mismatches);
                w.WriteString("detail", f.Detail);
                w.WriteBoolean("passed", f.Passed);
                w.WriteStartArray("failures");
                foreach (var s in f.Failures) w.WriteStringValue(s);
                w.WriteEndArray();
                w.WriteEndObject();
            }
            w.WriteEndArray();
            w.WriteBoolean("passed", t.Passed);
            Number(w, "seconds", t.Seconds);
            Number(w, "build_seconds", t.BuildSeconds);
            Number(w, "seconds_per_vector", t.SecondsPerVector);
            w.WriteStartArray("failures");
            foreach (var f in t.Failures) w.WriteStringValue(f);
            w.WriteEndArray();
            w.WriteEndObject();
        }
        w.WriteEndArray();
        w.WriteString("caution", VerifyReport.Caution);
        w.WriteEndObject();
    }

    /// <summary>
    /// A number, or null when absent; infinity and not-a-number (which JSON lacks) are written as the strings
    /// "inf"/"nan".
    /// </summary>
    private static void Number(Utf8JsonWriter w, string name, double? value)
    {
        if (value is not { } x) w.WriteNull(name);
        else if (double.IsPositiveInfinity(x)) w.WriteString(name, "inf");
        else if (double.IsNaN(x) || double.IsInfinity(x)) w.WriteString(name, "nan");
        else w.WriteNumber(name, x);
    }
}
