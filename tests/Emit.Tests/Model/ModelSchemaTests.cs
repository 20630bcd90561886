using System.Text.Json;
using Emit.Model;
using Json.Schema;

namespace Emit.Tests.Model;

/// <summary>
/// The published schema (docs/model.schema.json), checked with an outside JSON Schema validator
/// (JsonSchema.Net, draft 2020-12), against files emit writes and against files it must refuse.
/// </summary>
public sealed class ModelSchemaTests
{
    // The validator registers a schema by its $id once per process, so load it once.
    private static readonly Lazy<JsonSchema> Loaded = new(Load);

    private static JsonSchema Schema() => Loaded.Value;

    private static JsonSchema Load()
    {
        var dir = AppContext.BaseDirectory;
        while (!File.Exists(Path.Combine(dir, "docs", "model.schema.json"))) dir = Path.GetDirectoryName(dir)!;
        return JsonSchema.FromText(File.ReadAllText(Path.Combine(dir, "docs", "model.schema.json")));
    }

    private static bool Valid(string json) =>
        Schema().Evaluate(JsonDocument.Parse(json).RootElement).IsValid;

    [Theory]
    [InlineData(ModelKind.Rbm)]
    [InlineData(ModelKind.Lateral)]
    [InlineData(ModelKind.General)]
    public void Files_emit_writes_satisfy_the_schema(ModelKind kind)
    {
        var m = TestModels.Random(kind, 6, 4, 1);
        Assert.True(Valid(ModelJson.ToText(m)));
        Assert.True(Valid(ModelJson.Canonical(m)));
    }

    [Theory]
    [InlineData("\"kind\":\"rbm\"", "\"kind\":\"dbn\"")]
    [InlineData("\"version\":1", "\"version\":2")]
    [InlineData("\"hidden\":4", "\"hidden\":-1")]
    [InlineData("\"hidden\":4", "\"hidden\":4,\"extra\":1")]
    [InlineData("\"kind\":\"rbm\"", "\"kind\":\"rbm\",\"visible_links\":[[0,1,0.5]]")]
    public void Schema_rejects_what_the_reader_rejects(string from, string to)
    {
        var text = ModelJson.Canonical(TestModels.Random(ModelKind.Rbm, 6, 4, 1));
        Assert.Contains(from, text);
        var bad = text.Replace(from, to);
        Assert.False(Valid(bad));
        Assert.Throws<EmitException>(() => ModelJson.Parse(System.Text.Encoding.UTF8.GetBytes(bad), "bad.json"));
    }
}
