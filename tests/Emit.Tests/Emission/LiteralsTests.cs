using System.Globalization;
using Emit.Emission;
using Emit.Quantize;

namespace Emit.Tests.Emission;

public sealed class LiteralsTests
{
    private static readonly float[] FloatSamples =
    [
        0f, -0f, 1f, -1f, 0.1f, 1e-7f, 3.4028235e38f, -3.4028235e38f, float.Epsilon, 1.17549435e-38f, 123456789f,
        16777216f, 0.333333343f, 2.5f, 1e10f, 100f,
    ];

    private static readonly double[] DoubleSamples =
    [
        0.0, -0.0, 1.0, -1.0, 0.1, 1e-300, double.MaxValue, double.Epsilon, 2.2250738585072014e-308, 1e22, 1e23,
        0.30000000000000004, 123456789012345678.0, 100.0,
    ];

    private static IEnumerable<float> RandomFloats()
    {
        var rng = new Random(3);
        for (int k = 0; k < 200; k++) yield return BitConverter.Int32BitsToSingle(rng.Next() & 0x7F7FFFFF) * (k % 2 == 0 ? 1 : -1);
    }

    private static IEnumerable<double> RandomDoubles()
    {
        var rng = new Random(4);
        for (int k = 0; k < 200; k++) yield return BitConverter.Int64BitsToDouble(rng.NextInt64() & 0x7FEFFFFFFFFFFFFF) * (k % 2 == 0 ? 1 : -1);
    }

    [Fact]
    public void Literals_have_a_point_or_exponent_the_right_digits_and_round_trip_in_dotnet()
    {
        foreach (var f in FloatSamples.Concat(RandomFloats()))
        {
            var lit = Literals.Float(f);
            Assert.Matches(@"^-?\d+(\.\d+)?(e[+-]\d+)?f$", lit);
            Assert.True(lit.Contains('.') || lit.Contains('e'), lit);
            Assert.True(SignificantDigits(lit) <= 9, lit);
            Assert.Equal(BitConverter.SingleToInt32Bits(f), BitConverter.SingleToInt32Bits(float.Parse(lit[..^1], CultureInfo.InvariantCulture)));
        }
        foreach (var d in DoubleSamples.Concat(RandomDoubles()))
        {
            var lit = Literals.Double(d);
            Assert.Matches(@"^-?\d+(\.\d+)?(e[+-]\d+)?$", lit);
            Assert.True(SignificantDigits(lit) <= 17, lit);
            Assert.Equal(BitConverter.DoubleToInt64Bits(d), BitConverter.DoubleToInt64Bits(double.Parse(lit, CultureInfo.InvariantCulture)));
        }
        Assert.Equal("-0.0f", Literals.Float(-0f));
        Assert.Equal("1.0f", Literals.Float(1f));
        Assert.Equal("0.100000001f", Literals.Float(0.1f));
        Assert.Equal("0.10000000000000001", Literals.Double(0.1));
    }

    private static int SignificantDigits(string literal)
    {
        var mantissa = literal.TrimEnd('f').TrimStart('-').Split('e')[0].Replace(".", "", StringComparison.Ordinal).Trim('0'); // zeros at either end are not significant
        return mantissa.Length;
    }

    [Fact]
    public void Upward_literals_never_fall_below_the_value()
    {
        foreach (var d in new[] { 1e-7, 0.1, 1.0 / 3, 12345.678901234, 5e-40 })
        {
            float f = float.Parse(Literals.Upward(d, NumericMode.F32)[..^1], CultureInfo.InvariantCulture);
            Assert.True(f >= d, $"{f:R} < {d:R}");
            Assert.True(MathF.BitDecrement(f) < d);
        }
    }

    [Fact]
    public void Values_too_large_for_float_are_refused_in_f32()
    {
        Assert.Throws<EmitException>(() => Literals.Round(1e39, NumericMode.F32, "w"));
        Assert.Equal(1e39, Literals.Round(1e39, NumericMode.F64, "w"));
    }

    /// <summary>The C compiler's own parsing (an outside implementation) reads every literal back to the same bits.</summary>
    [SkippableFact]
    public void C_compiler_reads_every_literal_back_to_the_same_bits()
    {
        var cc = Toolchain.Require("cc");
        var floats = FloatSamples.Concat(RandomFloats()).ToArray();
        var doubles = DoubleSamples.Concat(RandomDoubles()).ToArray();
        var src = "#include <stdio.h>\n#include <string.h>\n#include <stdint.h>\n" +
                  "static const float f[] = {\n" + string.Concat(floats.Select(x => "    " + Literals.Float(x) + ",\n")) + "};\n" +
                  "static const double d[] = {\n" + string.Concat(doubles.Select(x => "    " + Literals.Double(x) + ",\n")) + "};\n" +
                  "int main(void)\n{\n    size_t k;\n" +
                  "    for (k = 0; k < sizeof f / sizeof f[0]; ++k) { uint32_t b; memcpy(&b, &f[k], 4); printf(\"%lu\\n\", (unsigned long)b); }\n" +
                  "    for (k = 0; k < sizeof d / sizeof d[0]; ++k) { uint64_t b; memcpy(&b, &d[k], 8); printf(\"%llu\\n\", (unsigned long long)b); }\n" +
                  "    return 0;\n}\n";
        var dir = Toolchain.TempDir("literals");
        File.WriteAllText(Path.Combine(dir, "lit.c"), src);
        Toolchain.RunOk(cc, [.. Toolchain.Split(Toolchain.StrictC), Path.Combine(dir, "lit.c"), "-o", Path.Combine(dir, "lit")]);
        var lines = Toolchain.RunOk(Path.Combine(dir, "lit"), []).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        for (int k = 0; k < floats.Length; k++)
            Assert.Equal((uint)BitConverter.SingleToInt32Bits(floats[k]), uint.Parse(lines[k], CultureInfo.InvariantCulture));
        for (int k = 0; k < doubles.Length; k++)
            Assert.Equal((ulong)BitConverter.DoubleToInt64Bits(doubles[k]), ulong.Parse(lines[floats.Length + k], CultureInfo.InvariantCulture));
    }
}
