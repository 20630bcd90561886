using System.Text;
using System.Text.Json;
using Emit.Project;
using Json.Schema;

namespace Emit.Tests.Project;

/// <summary>
/// The published project schema (docs/project.schema.json), checked with an outside JSON Schema validator
/// (JsonSchema.Net, draft 2020-12) against projects the reader accepts and projects it refuses.
/// </summary>
public sealed class ProjectSchemaTests
{
    private static readonly Lazy<JsonSchema> Loaded = new(() =>
    {
        var dir = AppContext.BaseDirectory;
        while (!File.Exists(Path.Combine(dir, "docs", "project.schema.json"))) dir = Path.GetDirectoryName(dir)!;
        return JsonSchema.FromText(File.ReadAllText(Path.Combine(dir, "docs", "project.schema.json")));
    });

    private static bool Valid(string json) => Loaded.Value.Evaluate(JsonDocument.Parse(json).RootElement).IsValid;

    private const string Good = """
        {"format": "emit.project", "version": 1, "scorers": [
          {"model": "m.json"},
          {"model": "m.json", "name": "plant_q", "targets": ["c", "csharp"], "numeric": "fixed", "namespace": "Plant.Monitoring",
           "out": "gen/q", "selftest_vectors": 3, "weights": "int8", "accumulator": "int64", "softplus_table": 1024},
          {"model": "m.json", "name": "plant_f", "alarm_filter": "3/5", "explain": true, "stream": true},
          {"models": ["m.json", "m.json"], "priors": [0.8, 0.2], "name": "modes", "stream": false}
        ]}
        """;

    [Fact]
    public void A_project_the_reader_accepts_satisfies_the_schema()
    {
        var dir = ProjectFileTests.FolderWithModel();
        Assert.Equal(4, ProjectFile.Parse(Encoding.UTF8.GetBytes(Good), "p.json", dir).Scorers.Count);
        Assert.True(Valid(Good));
    }

    [Theory]
    [InlineData("\"version\": 1", "\"version\": 2")]
    [InlineData("\"format\": \"emit.project\"", "\"format\": \"emit.model\"")]
    [InlineData("{\"model\": \"m.json\"}", "{\"model\": \"m.json\", \"weights\": \"int8\"}")]
    [InlineData("{\"model\": \"m.json\"}", "{\"model\": \"m.json\", \"numeric\": \"f32\", \"softplus_table\": 256}")]
    [InlineData("{\"model\": \"m.json\"}", "{\"model\": \"m.json\", \"colour\": 1}")]
    [InlineData("{\"model\": \"m.json\"}", "{\"name\": \"x\"}")]
    [InlineData("\"softplus_table\": 1024", "\"softplus_table\": 1000")]
    [InlineData("\"plant_q\"", "\"9lives\"")]
    [InlineData("[\"c\", \"csharp\"]", "[\"rust\"]")]
    [InlineData("\"selftest_vectors\": 3", "\"selftest_vectors\": 0")]
    [InlineData("\"3/5\"", "\"3 of 5\"")]
    [InlineData("\"explain\": true", "\"explain\": 1")]
    [InlineData("\"stream\": false", "\"stream\": true")]
    [InlineData("\"name\": \"modes\", ", "")]
    [InlineData("{\"models\":", "{\"model\": \"m.json\", \"models\":")]
    [InlineData("\"plant_f\",", "\"plant_f\", \"priors\": [1, 2],")]
    [InlineData("\"priors\": [0.8, 0.2]", "\"priors\": [0.8, 0]")]
    [InlineData("[\"m.json\", \"m.json\"]", "[\"m.json\"]")]
    public void Schema_rejects_what_the_reader_rejects(string from, string to)
    {
        Assert.Contains(from, Good);
        var bad = Good.Replace(from, to);
        Assert.False(Valid(bad));
        var dir = ProjectFileTests.FolderWithModel();
        Assert.Throws<EmitException>(() => ProjectFile.Parse(Encoding.UTF8.GetBytes(bad), "p.json", dir));
    }
}
