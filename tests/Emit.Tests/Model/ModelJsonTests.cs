using Emit.Model;

namespace Emit.Tests.Model;

public sealed class ModelJsonTests
{
    private const string Small =
        "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"lateral\",\"visible\":3,\"hidden\":2,\"names\":[\"a\",\"b\\\"*/\",\"c\"]," +
        "\"visible_bias\":[0.1,-0.2,0.3],\"hidden_bias\":[0.5,-1e-7],\"weights\":[[1,2],[3,4],[5,6.25]]," +
        "\"visible_links\":[[1,2,0.5],[0,2,-0.25]],\"threshold\":3.5,\"metadata\":{\"trained\":\"2026-11-30\",\"n\":[1,2]}}";

    [Fact]
    public void Round_trip_preserves_every_field_and_identity()
    {
        var m = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(Small), "small.json");
        Assert.Equal(ModelKind.Lateral, m.Kind);
        Assert.Equal(6.25, m.Weight(2, 1));
        Assert.Equal(new Link(0, 2, -0.25), m.VisibleLinks[0]); // sorted on read
        var again = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(ModelJson.ToText(m)), "again.json");
        Assert.Equal(m.Sha256, again.Sha256);
        Assert.Equal(ModelJson.ToText(m), ModelJson.ToText(again));
        Assert.Contains("\"trained\"", again.MetadataJson);
    }

    [Fact]
    public void Identity_ignores_metadata_but_not_weights()
    {
        var m = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(Small), "a");
        var noMeta = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(Small.Replace("\"trained\"", "\"other\"")), "b");
        var changed = ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(Small.Replace("6.25", "6.26")), "c");
        Assert.Equal(m.Sha256, noMeta.Sha256);
        Assert.NotEqual(m.Sha256, changed.Sha256);
        Assert.Matches("^[0-9a-f]{64}$", m.Sha256);
    }

    [Theory]
    [InlineData("\"kind\":\"lateral\"", "\"kind\":\"boltz\"", "kind \"boltz\" is unknown")]
    [InlineData("\"version\":1", "\"version\":2", "version 2 is not supported")]
    [InlineData("[1,2,0.5]", "[2,2,0.5]", "self link")]
    [InlineData("[1,2,0.5]", "[1,3,0.5]", "out of range")]
    [InlineData("[1,2,0.5]", "[2,1,0.5]", "i > j")]
    [InlineData("[1,2,0.5]", "[0,2,0.5]", "twice")]
    [InlineData("[5,6.25]", "[5]", "weights row 2 has 1 values")]
    [InlineData("6.25", "1e400", "not a finite number")]
    [InlineData(",\"threshold\":3.5", "", null)]
    public void Bad_fields_are_named_with_line_and_column(string from, string to, string? expected)
    {
        var text = Small.Replace(from, to);
        if (expected is null)
        {
            Assert.Null(ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(text), "m.json").Threshold);
            return;
        }
        var e = Assert.Throws<EmitException>(() => ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(text), "m.json"));
        Assert.Contains(expected, e.Problem);
        Assert.Equal("m.json", e.File);
        Assert.NotNull(e.Line);
    }
}
