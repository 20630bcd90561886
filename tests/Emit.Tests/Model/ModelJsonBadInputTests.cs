using System.Text;
using Emit.Model;

namespace Emit.Tests.Model;

/// <summary>Damaged model files: each is one EmitException naming the file (and the line when there is one).</summary>
public sealed class ModelJsonBadInputTests
{
    private static readonly string Good = ModelJson.ToText(TestModels.Random(ModelKind.General, 4, 3, 6));

    private static EmitException Bad(byte[] bytes) =>
        Assert.Throws<EmitException>(() => ModelJson.Parse(bytes, "m.json"));

    [Fact]
    public void Empty_and_whitespace_files()
    {
        Assert.Contains("empty", Bad([]).Problem);
        Assert.Contains("empty", Bad("  \r\n "u8.ToArray()).Problem);
    }

    [Fact]
    public void Every_truncation_is_refused_with_a_position()
    {
        var bytes = Encoding.UTF8.GetBytes(Good);
        // Cutting anywhere before the closing brace leaves an incomplete object.
        int end = Good.LastIndexOf('}');
        for (int cut = 1; cut < end; cut += 7)
        {
            var e = Bad(bytes[..cut]);
            Assert.Equal("m.json", e.File);
            Assert.NotNull(e.Line);
        }
    }

    [Fact]
    public void Binary_garbage_is_refused()
    {
        var rng = new Random(1);
        for (int t = 0; t < 200; t++)
        {
            var junk = new byte[rng.Next(1, 200)];
            rng.NextBytes(junk);
            Assert.Equal("m.json", Bad(junk).File);
        }
    }

    [Fact]
    public void Byte_order_mark_and_crlf_are_accepted()
    {
        var text = "\uFEFF" + Good.Replace("\n", "\r\n");
        var m = ModelJson.Parse(Encoding.UTF8.GetBytes(text), "m.json");
        Assert.Equal(ModelJson.Parse(Encoding.UTF8.GetBytes(Good), "g").Sha256, m.Sha256);
    }

    [Theory]
    [InlineData("format")]
    [InlineData("version")]
    [InlineData("kind")]
    [InlineData("visible")]
    [InlineData("hidden")]
    [InlineData("visible_bias")]
    [InlineData("hidden_bias")]
    [InlineData("weights")]
    public void Each_missing_required_field_is_named(string field)
    {
        var doc = System.Text.Json.Nodes.JsonNode.Parse(Good)!.AsObject();
        doc.Remove(field);
        var e = Bad(Encoding.UTF8.GetBytes(doc.ToJsonString()));
        Assert.Contains($"missing field \"{field}\"", e.Problem);
    }

    [Theory]
    [InlineData("\"visible\": 4", "\"visible\": 5", "visible_bias has 4 values")]
    [InlineData("\"hidden\": 3", "\"hidden\": 2", "hidden_bias has 3 values")]
    [InlineData("\"visible\": 4", "\"visible\": 4.5", "whole number")]
    [InlineData("\"visible\": 4", "\"visible\": 99999999", "out of range")]
    [InlineData("\"format\": \"emit.model\"", "\"format\": \"other\"", "is not \"emit.model\"")]
    [InlineData("\"visible\": 4", "\"visible\": 4, \"visible\": 4", "appears twice")]
    public void Wrong_counts_and_values(string from, string to, string expected)
    {
        Assert.Contains(from, Good);
        Assert.Contains(expected, Bad(Encoding.UTF8.GetBytes(Good.Replace(from, to))).Problem);
    }

    [Fact]
    public void Absurd_sizes_are_refused()
    {
        var text = "{\"format\":\"emit.model\",\"version\":1,\"kind\":\"rbm\",\"visible\":1000000,\"hidden\":1000000,\"visible_bias\":[],\"hidden_bias\":[],\"weights\":[]}";
        Assert.Contains("more than", Bad(Encoding.UTF8.GetBytes(text)).Problem);
    }

    // Regression (found by the mutation property): invalid UTF-8 inside a string escaped as InvalidOperationException.
    [Fact]
    public void Invalid_utf8_in_a_string_is_the_tools_error()
    {
        var bytes = Encoding.UTF8.GetBytes(Good.Replace("\"general\"", "\"gen\u00e9ral\""));
        int k = Array.IndexOf(bytes, (byte)0xC3);
        bytes[k] = 0x8F;
        Assert.Contains("UTF-8", Bad(bytes).Problem);
    }
}
