using Emit.Quantize;
using Emit.Reference;
using MathNet.Numerics;
using MathNet.Numerics.Interpolation;

namespace Emit.Tests.Quantize;

public sealed class SoftplusTableTests
{
    /// <summary>
    /// The linear-interpolation error formula |f − p| ≤ h²/8 · max|f''| (Burden &amp; Faires, Numerical Analysis,
    /// interpolation error theorem; from memory), checked numerically: MathNet's LinearSpline (an outside
    /// implementation of piecewise-linear interpolation) through the exact nodes of G(d) = log1p(exp(−d)) is
    /// sampled densely; the error must lie in [0, bound of the segment] (G is convex), and on the first segment,
    /// where G'' is largest, the bound must be nearly attained as h shrinks (error → h²/8 · G''(h/2)).
    /// </summary>
    [Theory]
    [InlineData(64, 3)]
    [InlineData(256, 4)]
    [InlineData(1024, 4)]
    [InlineData(16, 2)]
    public void Interpolation_error_formula_holds_and_is_nearly_attained(int segments, int rangeLog2)
    {
        var table = new SoftplusTable(segments, rangeLog2, 20);
        var nodes = Enumerable.Range(0, segments + 1).Select(table.Node).ToArray();
        var spline = LinearSpline.InterpolateSorted(nodes, nodes.Select(SoftplusTable.G).ToArray());
        const int samples = 64;
        for (int k = 0; k < segments; k++)
        {
            double worst = 0;
            for (int s = 1; s < samples; s++)
            {
                double d = nodes[k] + table.Step * s / samples;
                double err = spline.Interpolate(d) - SoftplusTable.G(d);
                Assert.True(err >= -1e-15, $"interpolant below G at {d}: {err}");
                Assert.True(err <= table.InterpolationBound(k) + 1e-15, $"segment {k}: error {err} above bound {table.InterpolationBound(k)}");
                worst = Math.Max(worst, err);
            }
            if (k == 0 && table.Step <= 1.0 / 16)
                Assert.True(worst >= 0.95 * table.InterpolationBound(0), $"bound {table.InterpolationBound(0)} far above the error {worst}");
        }
    }

    /// <summary>
    /// Entries against an outside formula: G(d) = −log σ(d) with σ from MathNet's SpecialFunctions.Logistic; each
    /// entry is that value times 2^E rounded, so it is within half an LSB (plus the double rounding of the check).
    /// </summary>
    [Theory]
    [InlineData(256, 4, 16)]
    [InlineData(64, 5, 20)]
    [InlineData(8, 0, 10)]
    public void Entries_are_rounded_values_of_log1p_exp_minus_d(int segments, int rangeLog2, int e)
    {
        var table = new SoftplusTable(segments, rangeLog2, e);
        Assert.Equal(segments + 1, table.Entries.Length);
        for (int k = 0; k <= segments; k++)
        {
            double g = -Math.Log(SpecialFunctions.Logistic(table.Node(k)));
            double diff = table.Entries[k] - Math.ScaleB(g, e);
            Assert.True(Math.Abs(diff) <= 0.5 + 1e-6, $"T[{k}] = {table.Entries[k]}, exact {Math.ScaleB(g, e)}");
            Assert.True(Math.Abs(table.EntryError(k) - diff) <= 1e-6);
        }
        Assert.Equal((long)Math.Round(Math.Log(2) * Math.ScaleB(1.0, e), MidpointRounding.AwayFromZero), table.Entries[0]);
        Assert.Equal(Math.ScaleB(1.0, rangeLog2), table.Node(segments));
    }

    /// <summary>
    /// Every integer input's actual error (integer softplus vs the double softplus) lies in the interval the
    /// analysis states for it, and the interval for the whole range is attained to within 2 LSB (fine tables).
    /// Covers both tails (inputs beyond ±R), d = 0 (no interpolation) and d &gt; 0.
    /// </summary>
    [Theory]
    [InlineData(64, 3, 16, 9)]
    [InlineData(256, 4, 18, 4)]   // d = 0: every input is a node
    [InlineData(32, 2, 14, 12)]
    [InlineData(16, 4, 20, 6)]
    public void Integer_softplus_error_lies_in_the_stated_interval(int segments, int rangeLog2, int e, int f)
    {
        var table = new SoftplusTable(segments, rangeLog2, e);
        long reach = (long)Math.ScaleB(1.5 * table.Range, f);
        var whole = table.SoftplusError(-reach, reach, f);
        double lsb = Math.ScaleB(1.0, -e);
        double lo = double.MaxValue, hi = double.MinValue;
        for (long a = -reach; a <= reach; a++)
        {
            double err = table.LookupSoftplus(a, f) * lsb - Softplus.Of(Math.ScaleB((double)a, -f));
            var point = table.SoftplusError(a, a, f);
            Assert.True(err >= point.Lo - 1e-12 && err <= point.Hi + 1e-12, $"a = {a}: error {err} outside {point}");
            lo = Math.Min(lo, err);
            hi = Math.Max(hi, err);
        }
        Assert.True(lo >= whole.Lo - 1e-12 && hi <= whole.Hi + 1e-12);
        // Tight to 2 LSB, except that h²/8 · max G'' over-states a coarse segment's error (G'' is not constant).
        double slack = 2 * lsb + (table.Step > 0.25 ? 0.1 * table.InterpolationBound(0) : 0);
        Assert.True(whole.Hi - hi <= slack && lo - whole.Lo <= slack, $"stated {whole}, found [{lo}, {hi}]");
    }

    [Fact]
    public void Entries_never_increase_and_fit_the_stated_element_type()
    {
        var small = new SoftplusTable(256, 4, 14);
        Assert.Equal(new QFormat(16, 14, Signed: false), small.EntryFormat);
        Assert.Equal(257 * 2, small.Bytes);
        var large = new SoftplusTable(256, 4, 24);
        Assert.Equal(new QFormat(32, 24), large.EntryFormat);
        Assert.Equal(257 * 4, large.Bytes);
        for (int k = 0; k < 256; k++) Assert.True(large.Entries[k] >= large.Entries[k + 1]);
        Assert.Equal(large.Entries.Zip(large.Entries.Skip(1), (a, b) => a - b).Max(), large.MaxEntryStep);
    }
}
