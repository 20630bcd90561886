using System.Globalization;
using System.Text;
using System.Xml;

namespace Emit.Harness;

/// <summary>
/// The JUnit XML report CI servers read: one <c>testsuites</c> holding one <c>testsuite</c> with one <c>testcase</c>
/// per target; a failed target has a <c>failure</c> element whose message is the first reason and whose text lists them
/// all. The model and its SHA-256 go into the suite's <c>properties</c>.
/// </summary>
public static class ReportJUnit
{
    /// <summary>Writes <paramref name="report"/> as JUnit XML, one test case per target.</summary>
    public static void Write(VerifyReport report, Stream output)
    {
        var inv = CultureInfo.InvariantCulture;
        var settings = new XmlWriterSettings { Indent = true, Encoding = new UTF8Encoding(false), NewLineChars = "\n" };
        using var w = XmlWriter.Create(output, settings);
        int failures = report.Targets.Count(t => !t.Passed) + report.Targets.Sum(t => t.Features.Count(f => !f.Passed));
        int tests = report.Targets.Count + report.Targets.Sum(t => t.Features.Count);
        string time = report.Targets.Sum(t => t.Seconds).ToString("F3", inv);
        string suite = "emit verify " + report.Model;
        w.WriteStartDocument();
        w.WriteStartElement("testsuites");
        w.WriteAttributeString("name", "emit verify");
        w.WriteAttributeString("tests", tests.ToString(inv));
        w.WriteAttributeString("failures", failures.ToString(inv));
        w.WriteAttributeString("errors", "0");
        w.WriteAttributeString("time", time);
        w.WriteStartElement("testsuite");
        w.WriteAttributeString("name", suite);
        w.WriteAttributeString("tests", tests.ToString(inv));
        w.WriteAttributeString("failures", failures.ToString(inv));
        w.WriteAttributeString("errors", "0");
        w.WriteAttributeString("skipped", "0");
        w.WriteAttributeString("time", time);
        w.WriteStartElement("properties");
        Property(w, "model", report.Model);
        Property(w, "model_sha256", report.ModelSha256);
        Property(w, "input", report.Input);
        Property(w, "vectors", report.Vectors.ToString(inv));
        Property(w, "tool", "emit " + report.ToolVersion);
        Property(w, "allow_model_change", report.AllowModelChange ? "true" : "false");
        Property(w, "fail_on_decision_mismatch", report.FailOnDecisionMismatch ? "true" : "false");
        w.WriteEndElement();
        foreach (var t in report.Targets)
        {
            w.WriteStartElement("testcase");
            w.WriteAttributeString("name", $"{t.Target} {t.Numeric} {t.Weights}");
            w.WriteAttributeString("classname", "emit.verify." + report.Model);
            w.WriteAttributeString("time", t.Seconds.ToString("F3", inv));
            if (!t.Passed)
            {
                w.WriteStartElement("failure");
                var first = t.Failures.Count > 0 ? t.Failures[0] : "failed";
                w.WriteAttributeString("message", Clean(first).Split('\n')[0]);
                w.WriteAttributeString("type", "emit.verify.mismatch");
                w.WriteString(Clean(string.Join("\n", t.Failures)));
                w.WriteEndElement();
            }
            w.WriteStartElement("system-out");
            w.WriteString(Clean(Summary(t)));
            w.WriteEndElement();
            w.WriteEndElement();
            foreach (var f in t.Features) Feature(w, report, t, f);
        }
        w.WriteEndElement();
        w.WriteEndElement();
        w.WriteEndDocument();
    }

    /// <summary>One test case per feature and target, named "TARGET NUMERIC WEIGHTS FEATURE".</summary>
    private static void Feature(XmlWriter w, VerifyReport report, TargetResult t, FeatureResult f)
    {
        w.WriteStartElement("testcase");
        w.WriteAttributeString("name", $"{t.Target} {t.Numeric} {t.Weights} {f.Feature}");
        w.WriteAttributeString("classname", "emit.verify." + report.Model);
        w.WriteAttributeString("time", "0");
        if (!f.Passed)
        {
            w.WriteStartElement("failure");
            var first = f.Failures.Count > 0 ? f.Failures[0] : $"{f.Mismatches} mismatches";
            w.WriteAttributeString("message", Clean(first).Split('\n')[0]);
            w.WriteAttributeString("type", "emit.verify.feature");
            w.WriteString(Clean(string.Join("\n", f.Failures)));
            w.WriteEndElement();
        }
        w.WriteStartElement("system-out");
        w.WriteString(Clean($"{f.Checks} checked, {f.Mismatches} mismatches; {f.Detail}"));
        w.WriteEndElement();
        w.WriteEndElement();
    }

    private static string Summary(TargetResult t)
    {
        var inv = CultureInfo.InvariantCulture;
        string G(double? x) => x is { } v ? v.ToString("G4", inv) : "-";
        return $"vectors {t.Vectors}, max |error| {G(t.MaxAbsError)}, mean |error| {G(t.MeanAbsError)}, bound " +
            $"{G(t.ErrorBound)} nats, " +
               $"bit-exact {(t.BitExact is { } b ? (b ? "yes" : "no") : "n/a")}, decision mismatches " +
               $"{t.DecisionMismatches} " +
               $"(unexplained {t.UnexplainedMismatches}), sources {t.Sources}, model hash " +
               $"{(t.ModelHashMatches ? "matches" : "DIFFERS")}" +
               (t.SourcesMatch is { } match ? $", sources {(match ? "as generated" : "NOT as generated")}" : "") +
               (t.Compared ? "" : ", numbers not compared");
    }

    private static void Property(XmlWriter w, string name, string value)
    {
        w.WriteStartElement("property");
        w.WriteAttributeString("name", name);
        w.WriteAttributeString("value", Clean(value));
        w.WriteEndElement();
    }

    /// <summary>Drops characters XML 1.0 cannot hold (compiler output may carry control characters).</summary>
    private static string Clean(string text)
    {
        var sb = new StringBuilder(text.Length);
        for (int i = 0; i < text.Length; i++)
        {
            if (i + 1 < text.Length && XmlConvert.IsXmlSurrogatePair(text[i + 1], text[i]))
                sb.Append(text[i]).Append(text[++i]);
            else if (XmlConvert.IsXmlChar(text[i]) && (text[i] >= ' ' || text[i] is '\n' or '\t')) sb.Append(text[i]);
        }
        return sb.ToString();
    }
}
