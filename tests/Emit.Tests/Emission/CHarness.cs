using Emit.Emission;
using Emit.Quantize;
using Emit.Harness;

namespace Emit.Tests.Emission;

/// <summary>
/// Builds a generated C scorer in a folder with the product's harness main (<see cref="HostCRunner"/>, strict flags) and
/// runs it over inputs: per input the free energy from the packed entry point, whether the units entry point gave the
/// same bits, and the decision; plus the self-test result.
/// </summary>
internal static class CHarness
{
    /// <summary>One result; in fixed mode <see cref="Integer"/> is the returned integer and <see cref="Energy"/> the same value as a double.</summary>
    public sealed record Row(double Energy, bool SameBits, int Unusual, long Integer = 0);

    public sealed record Result(int SelfTestFailures, IReadOnlyList<Row> Rows);

    /// <summary>A built harness: the executable and how to read its results.</summary>
    public sealed record Built(string Exe, ScorerSources Sources, HarnessLayout Layout, bool IsFixed);

    /// <summary>
    /// Compiles NAME.c in <paramref name="dir"/> and the harness main with the strict flags (plus extra flags). The
    /// numeric mode and result width come from the manifest beside the sources; <paramref name="integer"/> states that it is fixed point.
    /// </summary>
    public static Built Build(string dir, string name, bool hasThreshold, string extraFlags = "", bool integer = false)
    {
        Toolchain.Require("cc");
        var sources = ScorerSources.Locate(dir, "c", name, name);
        Assert.Equal(hasThreshold, sources.HasThreshold);
        var mode = sources.Manifest.Numeric;
        Assert.Equal(integer, mode == NumericMode.Fixed);
        var layout = new HarnessLayout(sources.Manifest.Visible, sources.Manifest.EnergyBytes);
        var exe = HostCRunner.Build(sources, layout, new RunnerSettings("cc", extraFlags, Toolchain.Limit), Path.Combine(dir, "harness-" + name), out var failure);
        Assert.True(exe is not null, failure);
        return new Built(exe!, sources, layout, mode == NumericMode.Fixed);
    }

    public static Result Run(Built built, IEnumerable<byte[]> vectors)
    {
        var input = string.Concat(vectors.Select(v => Convert.ToHexStringLower(SelfTestVectors.Pack(v)) + "\n"));
        var output = Toolchain.RunOk(built.Exe, [], stdin: input);
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        int? selfTest = built.Layout.ReadHeader(lines[0], out var failure);
        Assert.True(selfTest is not null, failure);
        var rows = lines.Skip(1).Select(l =>
        {
            Assert.True(built.Layout.TryParseRow(l, out var row), l);
            if (built.IsFixed)
            {
                long n = built.Layout.EnergyBytes == 4 ? unchecked((int)(uint)row.Bits) : unchecked((long)row.Bits);
                return new Row(n, row.SameBits, row.Decision, n);
            }
            double energy = built.Layout.EnergyBytes == 4 ? BitConverter.UInt32BitsToSingle((uint)row.Bits) : BitConverter.UInt64BitsToDouble(row.Bits);
            return new Row(energy, row.SameBits, row.Decision);
        }).ToArray();
        return new Result(selfTest!.Value, rows);
    }
}
