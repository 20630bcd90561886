using System.Globalization;
using System.Runtime.CompilerServices;
using Emit.Emission;
using Emit.Model;

namespace Emit.Tests.Emission;

/// <summary>
/// The generated C against an outside implementation: numpy (Debian python3-numpy), whose logaddexp gives a stable
/// softplus and log-sum-exp (numpy reference: numpy.logaddexp, "Logarithm of the sum of exponentiations of the inputs").
/// </summary>
public sealed class NumpyCrossCheckTests
{
    private static string ScriptPath([CallerFilePath] string here = "") => Path.Combine(Path.GetDirectoryName(here)!, "numpy_free_energy.py");

    public static TheoryData<string, NumericMode> Cases() => GeneratedCTests.Cases();

    [SkippableTheory]
    [MemberData(nameof(Cases))]
    public void Generated_c_agrees_with_numpy(string id, NumericMode mode)
    {
        // Debian's interpreter first: python3-numpy installs there, whatever other python3 comes first on PATH
        var python = new[] { "/usr/bin/python3", Toolchain.Find("python3") }
            .FirstOrDefault(p => p is not null && File.Exists(p) && Toolchain.Run(p, ["-c", "import numpy"]).Exit == 0);
        Assert.False(python is null && Toolchain.InCi, "python3 with numpy (Debian python3-numpy) is required under CI=true");
        Skip.If(python is null, "no python3 with numpy is installed");

        var c = CodegenCases.All.Single(x => x.Id == id);
        var dir = Toolchain.TempDir("numpy-" + id);
        var modelPath = Path.Combine(dir, "model.json");
        ModelJson.WriteFile(c.Model, modelPath);
        var vectors = CodegenCases.Vectors(c);
        var vectorPath = Path.Combine(dir, "vectors.txt");
        File.WriteAllText(vectorPath, string.Concat(vectors.Select(v => CodegenCases.Bits(v) + "\n")));
        var numpy = Toolchain.RunOk(python!, [ScriptPath(), modelPath, vectorPath])
            .Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(s => double.Parse(s, CultureInfo.InvariantCulture)).ToArray();

        var name = CodegenCases.Generate(c, mode, dir);
        var generated = CHarness.Run(CHarness.Build(dir, name, c.Model.Threshold.HasValue), vectors);
        Assert.Equal(vectors.Count, numpy.Length);
        double rel = GeneratedCTests.RelativeTolerance(mode);
        for (int k = 0; k < vectors.Count; k++)
            Assert.True(Math.Abs(generated.Rows[k].Energy - numpy[k]) <= rel * Math.Max(1.0, Math.Abs(numpy[k])),
                $"{name} vector {k}: generated {generated.Rows[k].Energy:R}, numpy {numpy[k]:R}");
    }
}
