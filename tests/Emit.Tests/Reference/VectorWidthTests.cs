using System.Diagnostics;
using Emit.Model;
using Emit.Tests.Cli;
using Emit.Tests.Emission;

namespace Emit.Tests.Reference;

/// <summary>
/// The reference free energies have the same bits whatever vector instructions the processor offers: <c>emit score</c>
/// in this process against child processes where the runtime is told not to use AVX-512, AVX2, or any SIMD
/// (.NET 10's DOTNET_EnableAVX512, DOTNET_EnableAVX2 and DOTNET_EnableHWIntrinsic switches; on .NET 10 the older
/// DOTNET_EnableAVX512F no longer turns Vector512 acceleration off, checked by hand). On a processor without
/// AVX-512 the first case compares like with like and still passes.
/// </summary>
public sealed class VectorWidthTests
{
    [Theory]
    [InlineData("DOTNET_EnableAVX512")]
    [InlineData("DOTNET_EnableAVX2")]
    [InlineData("DOTNET_EnableHWIntrinsic")]
    public async Task Scores_have_the_same_bits_without_wide_vectors(string switchOff)
    {
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(TestModels.Random(ModelKind.Lateral, 131, 77, 5, scale: 0.4, linkDensity: 0.02), model,
            force: true);
        var rng = new Random(8);
        var data = Path.Combine(dir, "v.csv");
        File.WriteAllLines(data, Enumerable.Range(0, 400)
            .Select(_ => string.Join(",", TestModels.RandomUnits(131, rng, rng.NextDouble()))));
        var here = CliRunner.Run("score", model, "--input", data);
        Assert.Equal(0, here.ExitCode);

        var psi = new ProcessStartInfo(Toolchain.Require("dotnet"))
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (var a in new[] { typeof(Emit.Cli.CliApp).Assembly.Location, "score", model, "--input", data })
            psi.ArgumentList.Add(a);
        psi.Environment[switchOff] = "0";
        using var p = Process.Start(psi)!;
        var err = p.StandardError.ReadToEndAsync();
        string output = await p.StandardOutput.ReadToEndAsync();
        await p.WaitForExitAsync().WaitAsync(TimeSpan.FromMinutes(2));
        Assert.True(p.ExitCode == 0, await err);
        Assert.Equal(here.Out, output);
    }
}
