using Emit.Harness;

namespace Emit.Tests.Harness;

/// <summary>The harness line format of docs/verify-report.md (our own): three fields, then feature groups.</summary>
public sealed class HarnessLayoutTests
{
    private static readonly HarnessLayout Layout = new(10, 4);

    [Fact]
    public void A_plain_line_has_no_feature_groups()
    {
        Assert.True(Layout.TryParseRow("c0a00000 1 0", out var row));
        Assert.Equal(0xc0a00000UL, row.Bits);
        Assert.True(row.SameBits);
        Assert.Equal(0, row.Decision);
        Assert.Null(row.Features);
        Assert.Null(row.Group("filter"));
    }

    [Fact]
    public void Feature_groups_are_read_by_name()
    {
        Assert.True(Layout.TryParseRow("c0a00000 1 1 filter:1 classify:0,ff,12", out var row));
        Assert.Equal("1", row.Group("filter"));
        Assert.Equal("0,ff,12", row.Group("classify"));
        Assert.Null(row.Group("class"));
        Assert.Null(row.Group("stream"));
    }

    [Theory]
    [InlineData("c0a00000 1 1 filter")]
    [InlineData("c0a00000 1 1 :1")]
    [InlineData("c0a00000 1")]
    [InlineData("c0a0000 1 1")]
    public void Malformed_lines_are_refused(string line) => Assert.False(Layout.TryParseRow(line, out _));
}
