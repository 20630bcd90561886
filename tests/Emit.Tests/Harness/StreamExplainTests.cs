using Emit.Emission;
using Emit.Emission.Dialects;
using Emit.Harness;
using Emit.Model;
using Emit.Quantize;
using Emit.Reference;
using Emit.Tests.Emission;
using Emit.Tests.Model;

namespace Emit.Tests.Harness;

/// <summary>
/// Streamed scoring and explanations in generated code, checked by verify against the double-precision reference
/// scorer (itself checked against brute-force enumeration and scikit-learn), the integer simulator and the
/// reference explainer (checked against brute force: two full reference scores per flip).
/// </summary>
public sealed class StreamExplainTests
{
    private static VerifyReport Run(BoltzmannModel model, NumericMode mode, string[] targets, string dir,
        FixedPointOptions? fixedOptions = null)
    {
        var rng = new Random(5);
        var vectors = Enumerable.Range(0, 60)
            .Select(_ => Enumerable.Range(0, model.Visible).Select(_ => (byte)(rng.NextDouble() < 0.4 ? 1 : 0)).ToArray())
            .ToList();
        return Verifier.Run(new VerifyRequest
        {
            Model = model,
            ModelLabel = "m.json",
            InputPath = VerifyCases.WriteVectors(dir, vectors),
            Targets = targets,
            Numeric = mode,
            Fixed = fixedOptions,
            Settings = VerifyCases.Settings(),
            Stream = true,
            Explain = true,
        });
    }

    /// <summary>Every target runs the walks and explanations and agrees with the reference (and simulator).</summary>
    [SkippableTheory]
    [InlineData(ModelKind.Rbm, NumericMode.F32, "c,csharp")]
    [InlineData(ModelKind.Lateral, NumericMode.F32, "c,csharp")]
    [InlineData(ModelKind.Rbm, NumericMode.Fixed, "c,csharp")]
    [InlineData(ModelKind.Lateral, NumericMode.Fixed, "c,csharp,cortex-m3")]
    [InlineData(ModelKind.Lateral, NumericMode.F64, "c")]
    public void Stream_and_explain_agree_with_the_reference(ModelKind kind, NumericMode mode, string targets)
    {
        var names = targets.Split(',');
        VerifyCases.Require(names);
        var dir = Toolchain.TempDir($"stream-{kind}-{mode}");
        // 21 visible units: a partial last byte; the walk (72 flips) passes a float resync (64 flips)
        var model = TestModels.Random(kind, 21, 7, seed: 11, scale: 0.8, linkDensity: 0.3);
        var report = Run(model, mode, names, dir);
        Assert.True(report.Passed, VerifyCases.Describe(report));
        foreach (var t in report.Targets)
        {
            Assert.Equal(["stream", "explain"], t.Features.Select(f => f.Feature));
            Assert.All(t.Features, f => Assert.Equal(60, f.Checks));
            Assert.All(t.Features, f => Assert.True(f.Passed, f.Detail));
        }
    }

    /// <summary>
    /// Regression: with 16 or more hidden units, int16/int8 weights and an int32 accumulator the speed layout stores
    /// the weight rows packed (CDialect.PackedRows); the stream once read that table as plain weights.
    /// </summary>
    [SkippableTheory]
    [InlineData(ModelKind.Rbm, WeightType.Int16)]
    [InlineData(ModelKind.Rbm, WeightType.Int8)]
    [InlineData(ModelKind.Lateral, WeightType.Int16)]
    public void Stream_and_explain_read_packed_weight_rows(ModelKind kind, WeightType weights)
    {
        VerifyCases.Require(["c"]);
        var dir = Toolchain.TempDir($"stream-packed-{kind}-{weights}");
        var model = TestModels.Random(kind, 21, 20, seed: 12, scale: 0.2, linkDensity: 0.2);
        var options = new FixedPointOptions(weights, AccumulatorType.Int32);
        var plan = FixedPointPlanner.Build(model, options);
        Assert.True(CDialect.UsesPackedRows(plan, OptimizeFor.Speed), "the case must use packed rows");
        var report = Run(model, NumericMode.Fixed, ["c"], dir, options);
        Assert.True(report.Passed, VerifyCases.Describe(report));
        Assert.All(report.Targets.Single().Features, f => Assert.True(f.Passed, f.Detail));
    }

    /// <summary>A wrong stream result or a misordered explanation fails the feature (the checks can fail).</summary>
    [Fact]
    public void Checks_fail_on_wrong_results()
    {
        var model = TestModels.Random(ModelKind.Lateral, 10, 4, seed: 3);
        var expectation = NumericExpectation.For(model, NumericMode.F64, null);
        var units = new byte[10];
        units[2] = 1;
        var packed = new byte[] { 0x04, 0 };

        // the right values pass, a value off by 1e-3 nats fails
        var (first, last) = StreamWalk.Run(packed, units.ToArray());
        var reference = new ReferenceScorer(model);
        string Hex(double e) => BitConverter.DoubleToUInt64Bits(e).ToString("x16");
        var good = new StreamCheck(model, expectation);
        good.Add(0, units, packed, new ScoredRow(0, true, -1,
            $"stream:{Hex(reference.FreeEnergy(first))},{Hex(reference.FreeEnergy(last))}"));
        Assert.True(good.Result().Passed);
        var bad = new StreamCheck(model, expectation);
        bad.Add(0, units, packed, new ScoredRow(0, true, -1,
            $"stream:{Hex(reference.FreeEnergy(first))},{Hex(reference.FreeEnergy(last) + 1e-3)}"));
        Assert.Equal(1, bad.Result().Mismatches);

        // brute force: ΔF_i = F(v with i flipped) − F(v), two full reference scores per unit
        var deltas = new double[10];
        for (int i = 0; i < 10; i++)
        {
            var flipped = units.ToArray();
            flipped[i] ^= 1;
            deltas[i] = reference.FreeEnergy(flipped) - reference.FreeEnergy(units);
        }
        var order = Enumerable.Range(0, 10).OrderBy(i => deltas[i]).ThenBy(i => i).Take(4).ToArray();
        string Group(IEnumerable<int> list) =>
            "explain:4" + string.Concat(list.Select(i => "," + i + "," + Hex(deltas[i])));
        var right = new ExplainCheck(model, expectation);
        right.Add(0, units, new ScoredRow(0, true, -1, Group(order)));
        Assert.True(right.Result().Passed, string.Join("; ", right.Result().Failures));
        var reversed = new ExplainCheck(model, expectation);
        reversed.Add(0, units, new ScoredRow(0, true, -1, Group(order.Reverse())));
        if (deltas[order[3]] - deltas[order[0]] > 1e-6) Assert.Equal(1, reversed.Result().Mismatches);
        var missing = new ExplainCheck(model, expectation);
        missing.Add(0, units, new ScoredRow(0, true, -1, "stream:0"));
        Assert.Equal(1, missing.Result().Mismatches);
    }

    /// <summary>Kind general has no per-unit update: the options are refused with a one-line error.</summary>
    [Theory]
    [InlineData(true, false)]
    [InlineData(false, true)]
    public void General_models_are_refused(bool stream, bool explain)
    {
        var model = TestModels.Random(ModelKind.General, 6, 3, seed: 2);
        var e = Assert.Throws<EmitException>(() => ScorerCompiler.Compile(model, "g.json",
            new CompileOptions(["c"], NumericMode.F32, "g", Stream: stream, Explain: explain)));
        Assert.Contains("rbm and lateral", e.Message);
    }

    /// <summary>With the features off the sources are those of a plain compile; with them on the options are recorded.</summary>
    [Fact]
    public void Options_reach_banner_and_manifest()
    {
        var model = TestModels.Random(ModelKind.Rbm, 9, 3, seed: 4);
        var plain = ScorerCompiler.Build(model, "m.json", new CompileOptions(["c", "csharp"], NumericMode.Fixed, "m"));
        Assert.DoesNotContain(plain.Files, f => f.Text.Contains("stream", StringComparison.Ordinal));
        var on = ScorerCompiler.Build(model, "m.json",
            new CompileOptions(["c", "csharp"], NumericMode.Fixed, "m", Explain: true));
        Assert.All(on.Files, f => Assert.Contains("--explain", f.Text, StringComparison.Ordinal));
        Assert.Contains(on.Files, f => f.Text.Contains("m_stream_flip", StringComparison.Ordinal));
        Assert.True(on.Manifest.Explain);
        Assert.True(on.Manifest.HasStream);

        // the manifest round-trips the options, and they rebuild the same sources (what verify --generated does)
        var read = SourceManifestJson.Read(SourceManifestJson.Write(on.Manifest), "m.emit.json");
        Assert.True(read.Explain);
        Assert.False(read.Stream);
        var again = ScorerCompiler.Compile(model, "m.json", read.ToCompileOptions(["c", "csharp"], null));
        Assert.Equal(on.Files.Select(f => f.Text), again.Select(f => f.Text));
        Assert.DoesNotContain("stream", SourceManifestJson.Write(plain.Manifest), StringComparison.Ordinal);
    }

    /// <summary>The walk's generator: xorshift32 (13, 17, 5) from Marsaglia's paper, whose first output from seed 1 is 270369 (from memory; 1 → 1^(1&lt;&lt;13) = 8193, ^ (8193 &gt;&gt; 17) = 8193, ^ (8193 &lt;&lt; 5) = 270369 by hand).</summary>
    [Fact]
    public void Walk_generator_is_xorshift32() => Assert.Equal(270369u, StreamWalk.Next(1));
}
