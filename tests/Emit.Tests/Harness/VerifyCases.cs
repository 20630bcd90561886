using Emit.Harness;
using Emit.Tests.Emission;
using Emit.Vectors;

namespace Emit.Tests.Harness;

/// <summary>Shared set-up of the verify tests: tool checks that skip (or fail under CI=true) and vector files.</summary>
internal static class VerifyCases
{
    public static RunnerSettings Settings(int? imageInputs = null) => new("cc", "", Toolchain.Limit, imageInputs);

    /// <summary>Skips the test unless every named target's tools are installed (fails it under CI=true).</summary>
    public static void Require(params string[] targets)
    {
        foreach (var t in targets)
            Toolchain.RequireTools(() => Runners.Find(t)!.CheckTools(Settings()));
    }

    /// <summary>Writes vectors to a CSV file in <paramref name="dir"/>.</summary>
    public static string WriteVectors(string dir, IEnumerable<byte[]> vectors, string name = "vectors.csv")
    {
        var path = Path.Combine(dir, name);
        using var w = new StreamWriter(path);
        var writer = new VectorWriter(w, null);
        foreach (var v in vectors) writer.Write(v);
        return path;
    }

    /// <summary>Every field of a report, for assertion messages.</summary>
    public static string Describe(VerifyReport report)
    {
        var sb = new System.Text.StringBuilder();
        foreach (var t in report.Targets)
            sb.Append($"{t.Target}: passed {t.Passed}, vectors {t.Vectors}, max {t.MaxAbsError:R}, bound {t.ErrorBound:R}, failures: {string.Join(" | ", t.Failures)}\n");
        return sb.ToString();
    }
}
