using System.Globalization;
using System.Runtime.CompilerServices;
using Emit.Emission;
using Emit.Quantize;
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

    private static string Python()
    {
        // Debian's interpreter first: python3-numpy installs there, whatever other python3 comes first on PATH
        var python = new[] { "/usr/bin/python3", Toolchain.Find("python3") }
            .FirstOrDefault(p => p is not null && File.Exists(p) && Toolchain.Run(p, ["-c", "import numpy"]).Exit == 0);
        Assert.False(python is null && Toolchain.InCi, "python3 with numpy (Debian python3-numpy) is required under CI=true");
        Skip.If(python is null, "no python3 with numpy is installed");
        return python!;
    }

    private static double[] Numpy(string dir, BoltzmannModel model, IReadOnlyList<byte[]> vectors)
    {
        var modelPath = Path.Combine(dir, "model.json");
        ModelJson.WriteFile(model, modelPath, force: true);
        var vectorPath = Path.Combine(dir, "vectors.txt");
        File.WriteAllText(vectorPath, string.Concat(vectors.Select(v => CodegenCases.Bits(v) + "\n")));
        return Toolchain.RunOk(Python(), [ScriptPath(), modelPath, vectorPath])
            .Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(s => double.Parse(s, CultureInfo.InvariantCulture)).ToArray();
    }

    [SkippableTheory]
    [MemberData(nameof(Cases))]
    public void Generated_c_agrees_with_numpy(string id, NumericMode mode)
    {
        var c = CodegenCases.All.Single(x => x.Id == id);
        var dir = Toolchain.TempDir("numpy-" + id);
        var vectors = CodegenCases.Vectors(c);
        var numpy = Numpy(dir, c.Model, vectors);

        var name = CodegenCases.Generate(c, mode, dir);
        var generated = CHarness.Run(CHarness.Build(dir, name, c.Model.Threshold.HasValue), vectors);
        Assert.Equal(vectors.Count, numpy.Length);
        double rel = GeneratedCTests.RelativeTolerance(mode);
        for (int k = 0; k < vectors.Count; k++)
            Assert.True(Math.Abs(generated.Rows[k].Energy - numpy[k]) <= rel * Math.Max(1.0, Math.Abs(numpy[k])),
                $"{name} vector {k}: generated {generated.Rows[k].Energy:R}, numpy {numpy[k]:R}");
    }

    /// <summary>Every model shape and weight type with the int32 accumulator (int64 gives the same arithmetic at other formats; bit-exactness covers it).</summary>
    public static TheoryData<string> FixedCases()
    {
        var data = new TheoryData<string>();
        foreach (var c in FixedCodegenCases.All.Where(x => x.Accumulator == Emit.Quantize.AccumulatorType.Int32)) data.Add(c.Name);
        return data;
    }

    /// <summary>
    /// Fixed point: the generated C's integer over 2^E against numpy's double free energy, within the proved bound
    /// (plus 1e-9 for numpy's own rounding, far below any bound), on the float cases' inputs and the adversarial ones.
    /// </summary>
    [SkippableTheory]
    [MemberData(nameof(FixedCases))]
    public void Generated_fixed_c_agrees_with_numpy_within_the_stated_bound(string combo)
    {
        var c = FixedCodegenCases.Find(combo);
        var plan = FixedCodegenCases.Plan(c);
        var dir = Toolchain.TempDir("numpy-fixed-" + combo);
        var vectors = FixedCodegenCases.Vectors(c);
        var numpy = Numpy(dir, c.Case.Model, vectors);
        var name = FixedCodegenCases.Generate(c, dir);
        var generated = CHarness.Run(CHarness.Build(dir, name, c.Case.Model.Threshold.HasValue, integer: true), vectors);
        Assert.Equal(vectors.Count, numpy.Length);
        for (int k = 0; k < vectors.Count; k++)
        {
            double error = Math.Abs(generated.Rows[k].Integer / plan.EnergyScale - numpy[k]);
            Assert.True(error <= plan.ErrorBound + 1e-9, $"{name} vector {k}: generated {generated.Rows[k].Integer / plan.EnergyScale:R}, numpy {numpy[k]:R}, bound {plan.ErrorBound:R}");
        }
    }
}
