using System.Collections.Immutable;
using Emit.Emission;
using Emit.Quantize;
using Emit.Model;

namespace Emit.Tests.Emission;

/// <summary>Models of every kind for compile-and-run tests (invented data from fixed seeds) and their input vectors.</summary>
internal static class CodegenCases
{
    /// <summary>Unit names that try to escape comments, continue lines, start directives or break strings.</summary>
    public static readonly string[] HostileNames =
    [
        "*/ int injected = 1; /*", "quote \" inside", "back\\slash", "line\nbreak", "tab\there", "??= trigraph ??/",
        "#define broken 1", "%n%s%x", "Kühler-Temperatur °C", "", "ends with backslash \\", "\r\n#error x",
        "//", "/*", "*/", "??/", "\u2028separator", "\0nul", "日本語", "a", "A", "a",
    ];

    public sealed record Case(string Id, BoltzmannModel Model, int Vectors);

    public static BoltzmannModel WithNames(BoltzmannModel m, IReadOnlyList<string> names) =>
        new(m.Kind, m.Visible, m.Hidden, m.VisibleBias, m.HiddenBias, m.Weights, m.VisibleLinks, m.HiddenLinks,
            Enumerable.Range(0, m.Visible).Select(i => names[i % names.Count]).ToImmutableArray(), m.Threshold, m.LogPartition, m.MetadataJson);

    /// <summary>One case per shape of generated code: partial last byte, no hidden units, lateral with and without links, general small and at the limit.</summary>
    public static IReadOnlyList<Case> All { get; } =
    [
        new("rbm_a", WithNames(TestModels.Random(ModelKind.Rbm, 37, 11, seed: 11), HostileNames).With(threshold: -2.5, null), 80),
        new("rbm_b", TestModels.Random(ModelKind.Rbm, 16, 0, seed: 12), 40),
        new("rbm_c", TestModels.Random(ModelKind.Rbm, 1, 3, seed: 13, scale: 2.0), 4),
        // 19 hidden units: the row additions run in blocks of 16 plus a remainder when optimizing for speed
        new("rbm_d", TestModels.Random(ModelKind.Rbm, 24, 19, seed: 20), 40),
        new("lat_a", TestModels.Random(ModelKind.Lateral, 29, 7, seed: 14).With(threshold: 3.25, null), 80),
        new("lat_b", TestModels.Random(ModelKind.Lateral, 8, 5, seed: 15, linkDensity: 0), 40),
        new("gen_a", TestModels.Random(ModelKind.General, 12, 6, seed: 16, scale: 1.0), 60),
        new("gen_b", TestModels.Random(ModelKind.General, 20, FloatScorerPlan.MaxGeneralHidden, seed: 17), 12),
        new("gen_c", TestModels.Random(ModelKind.General, 5, 1, seed: 18), 20),
        new("gen_d", TestModels.Random(ModelKind.General, 9, 0, seed: 19), 20),
    ];

    /// <summary>All off, all on, then pseudo-random inputs of densities 1/2, 13/100, 87/100 (fixed seed).</summary>
    public static IReadOnlyList<byte[]> Vectors(Case c)
    {
        int v = c.Model.Visible;
        var rng = new Random(c.Id.Length * 1000 + c.Vectors);
        var list = new List<byte[]> { new byte[v], Enumerable.Repeat((byte)1, v).ToArray() };
        double[] p = [0.5, 0.13, 0.87];
        for (int k = 0; list.Count < c.Vectors; k++) list.Add(TestModels.RandomUnits(v, rng, p[k % 3]));
        return list;
    }

    public static string Bits(byte[] units) => string.Concat(units.Select(u => u != 0 ? '1' : '0'));

    /// <summary>Generated files for a case in a mode, written to <paramref name="dir"/>; returns the scorer name.</summary>
    public static string Generate(Case c, NumericMode mode, string dir, string target = "c")
    {
        var name = c.Id + "_" + mode.ToText();
        var files = ScorerCompiler.Build(c.Model, c.Id + ".json", new CompileOptions([target], mode, name, "Emit.Tests.Generated")).AllFiles;
        foreach (var f in files) File.WriteAllText(Path.Combine(dir, f.FileName), f.Text);
        return name;
    }
}
