using System.Text.Json;

namespace Emit.Tests.Model;

/// <summary>
/// The files written by numpy and scikit-learn in tests/reference/make_fixtures.py (Debian python3-numpy
/// 1.24.2, python3-sklearn 1.2.1; versions recorded in Fixtures/reference_versions.json).
/// </summary>
internal static class NpzFixtures
{
    public static string Path(string name) => System.IO.Path.Combine(AppContext.BaseDirectory, "Model", "Fixtures", name);

    /// <summary>The arrays numpy holds for one fixture, in visible × hidden layout, from expected_arrays.json.</summary>
    public sealed record Arrays(double[][] Weights, double[] VisibleBias, double[] HiddenBias);

    public static Arrays Expected(string name)
    {
        using var doc = JsonDocument.Parse(File.ReadAllBytes(Path("expected_arrays.json")));
        var e = doc.RootElement.GetProperty(name);
        static double[] Vector(JsonElement a) => a.EnumerateArray().Select(x => x.GetDouble()).ToArray();
        return new Arrays(
            e.GetProperty("weights").EnumerateArray().Select(Vector).ToArray(),
            Vector(e.GetProperty("visible_bias")),
            Vector(e.GetProperty("hidden_bias")));
    }

    /// <summary>Reads an "index,free_energy" CSV written with Python's repr (round-trip precision).</summary>
    public static double[] FreeEnergies(string name) =>
        File.ReadAllLines(Path(name)).Skip(1).Where(l => l.Length > 0)
            .Select(l => double.Parse(l.Split(',')[1], System.Globalization.CultureInfo.InvariantCulture)).ToArray();
}
