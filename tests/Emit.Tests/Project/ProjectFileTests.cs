using System.Text;
using Emit.Emission;
using Emit.Model;
using Emit.Project;
using Emit.Quantize;
using Emit.Tests.Emission;

namespace Emit.Tests.Project;

/// <summary>The project file reader (docs/project-file.md) and every bad input is one located error.</summary>
public sealed class ProjectFileTests
{
    /// <summary>A folder holding a small model file <c>m.json</c>, for paths in the projects below.</summary>
    internal static string FolderWithModel()
    {
        var dir = Toolchain.TempDir("project");
        ModelJson.WriteFile(TestModels.Random(ModelKind.Lateral, 10, 4, seed: 3).With(threshold: 2.0, null), Path.Combine(dir, "m.json"), force: true);
        return dir;
    }

    private static EmitProject Parse(string text, string dir) => ProjectFile.Parse(Encoding.UTF8.GetBytes(text), "p.json", dir);

    [Fact]
    public void Reads_every_field_with_paths_relative_to_the_project_folder()
    {
        var dir = FolderWithModel();
        Directory.CreateDirectory(Path.Combine(dir, "tpl"));
        var p = Parse("""
            {
              "format": "emit.project",
              "version": 1,
              // comments are allowed
              "scorers": [
                { "model": "m.json" },
                { "model": "m.json", "name": "plant_q", "targets": ["c", "csharp", "c"], "numeric": "fixed",
                  "namespace": "Plant.Monitoring", "out": "gen/q", "templates": "tpl", "selftest_vectors": 3,
                  "weights": "int8", "accumulator": "int64", "softplus_table": 1024 }
              ]
            }
            """, dir);
        Assert.Equal(2, p.Scorers.Count);
        var a = p.Scorers[0];
        Assert.Equal(Path.Combine(dir, "m.json"), a.ModelPath);
        Assert.Equal(Path.Combine(dir, "out"), a.OutDirectory);
        // The defaults of emit compile: target c, f32, the name from the model file, the default namespace.
        Assert.Equal(["c"], a.Options.Targets);
        Assert.Equal(NumericMode.F32, a.Options.Numeric);
        Assert.Equal("m", a.Options.Name);
        Assert.Equal(CompileOptions.DefaultNamespace, a.Options.Namespace);
        Assert.Equal(CompileOptions.DefaultSelfTestVectors, a.Options.SelfTestVectors);
        Assert.Null(a.Options.TemplatesDirectory);
        Assert.Null(a.Options.Fixed);
        Assert.Equal(6, a.Line);
        var b = p.Scorers[1];
        Assert.Equal(["c", "csharp"], b.Options.Targets);
        Assert.Equal(NumericMode.Fixed, b.Options.Numeric);
        Assert.Equal("plant_q", b.Options.Name);
        Assert.Equal("Plant.Monitoring", b.Options.Namespace);
        Assert.Equal(Path.Combine(dir, "gen", "q"), b.OutDirectory);
        Assert.Equal(Path.Combine(dir, "tpl"), b.Options.TemplatesDirectory);
        Assert.Equal(3, b.Options.SelfTestVectors);
        Assert.Equal(new FixedPointOptions(WeightType.Int8, AccumulatorType.Int64, 1024), b.Options.Fixed);
        Assert.Equal(7, b.Line);
    }

    [Fact]
    public void Reads_the_firmware_features_and_a_classifier_entry()
    {
        var dir = FolderWithModel();
        ModelJson.WriteFile(TestModels.Random(ModelKind.Lateral, 10, 4, seed: 4), Path.Combine(dir, "m2.json"), force: true);
        var p = Parse("""
            {
              "format": "emit.project",
              "version": 1,
              "scorers": [
                { "model": "m.json", "name": "plant", "alarm_filter": "3/5", "explain": true, "stream": false },
                { "models": ["m.json", "m2.json"], "priors": [0.8, 0.2], "name": "modes", "numeric": "fixed",
                  "out": "gen/modes" },
                { "models": ["m2.json", "m.json"], "name": "modes_even", "stream": false, "explain": false }
              ]
            }
            """, dir);
        var a = p.Scorers[0];
        Assert.Equal(new Emit.Detection.AlarmFilterSpec(3, 5), a.Options.AlarmFilter);
        Assert.True(a.Options.Explain);
        Assert.False(a.Options.Stream);
        Assert.False(a.IsClassifier);
        Assert.Equal([Path.Combine(dir, "m.json")], a.ModelPaths);
        var b = p.Scorers[1];
        Assert.True(b.IsClassifier);
        Assert.Equal([Path.Combine(dir, "m.json"), Path.Combine(dir, "m2.json")], b.ModelPaths);
        Assert.Equal(Path.Combine(dir, "m.json"), b.ModelPath);
        Assert.Equal([0.8, 0.2], b.Priors!);
        Assert.Equal("modes", b.Options.Name);
        Assert.Equal(NumericMode.Fixed, b.Options.Numeric);
        Assert.Null(b.Options.AlarmFilter);
        Assert.Equal(6, b.Line);
        Assert.Null(p.Scorers[2].Priors);
    }

    [Fact]
    public void Accepts_a_byte_order_mark_and_crlf_line_ends()
    {
        var dir = FolderWithModel();
        var text = "{\r\n\"format\": \"emit.project\",\r\n\"version\": 1,\r\n\"scorers\": [\r\n{ \"model\": \"m.json\" }\r\n]\r\n}\r\n";
        var p = ProjectFile.Parse([.. Encoding.UTF8.GetPreamble(), .. Encoding.UTF8.GetBytes(text)], "p.json", dir);
        Assert.Equal(5, p.Scorers[0].Line);
    }

    private const string Head = "{\"format\": \"emit.project\", \"version\": 1,\n";

    // Each case: the text; the token the error must point at (its first occurrence after the second line starts when
    // there is one, else in the whole text; "^" = the file's first character, "$" = its end, "" = no position); and a
    // fragment of the message. The expected line and column are counted from the text by the test itself.
    public static TheoryData<string, string, string> BadProjects => new()
    {
        { "", "", "file is empty" },
        { "  \n ", "", "file is empty" },
        { Head, "$", "not valid JSON" },
        { Head + "\"scorers\": [{\"model\": \"m.json\"}]", "$", "not valid JSON" },
        { "\u0001\u0002garbage", "^", "not valid JSON" },
        { "[]", "^", "expected a JSON object" },
        { "{\"format\": \"emit.model\", \"version\": 1, \"scorers\": []}", "\"emit.model\"", "is not \"emit.project\"" },
        { "{\"format\": \"emit.project\", \"version\": 2, \"scorers\": []}", "2", "version 2 is not supported" },
        { "{\"format\": \"emit.project\", \"format\": \"emit.project\"}", "\"format\": \"emit.project\"}", "\"format\" appears twice" },
        { Head + "\"extra\": 1}", "\"extra\"", "unknown field \"extra\"" },
        { "{\"version\": 1, \"scorers\": [{\"model\": \"m.json\"}]}", "^", "missing field \"format\"" },
        { "{\"format\": \"emit.project\", \"scorers\": [{\"model\": \"m.json\"}]}", "^", "missing field \"version\"" },
        { "{\"format\": \"emit.project\", \"version\": 1}", "^", "missing field \"scorers\"" },
        { Head + "\"scorers\": []}", "[", "scorers is empty" },
        { Head + "\"scorers\": [{\"model\": \"m.json\"},]}", "]}", "not valid JSON" },
        { Head + "\"scorers\": [{}]}", "{", "scorers[0] has no model" },
        { Head + "\"scorers\": [{\"model\": \"nope.json\"}]}", "\"nope", "file not found" },
        { Head + "\"scorers\": [{\"model\": \"\"}]}", "\"\"", "scorers[0].model is empty" },
        { Head + "\"scorers\": [{\"model\": \"a\\u0000b\"}]}", "\"a", "characters a path cannot have" },
        { Head + "\"scorers\": [{\"model\": 5}]}", "5", "expected a string for scorers[0].model" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"numeric\": \"f16\"}]}", "\"f16\"", "numeric \"f16\" is unknown" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"weights\": \"int8\"}]}", "\"weights\"", "weights applies to numeric fixed only" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"numeric\": \"fixed\", \"softplus_table\": 100}]}", "100", "not a power of two" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"numeric\": \"fixed\", \"softplus_table\": 4}]}", "4}", "out of range" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"selftest_vectors\": 1.5}]}", "1.5", "must be a whole number" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"selftest_vectors\": 1e999}]}", "1e999", "must be a whole number" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"name\": \"9lives\"}]}", "\"9lives\"", "scorers[0]:" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"namespace\": \"a..b\"}]}", "\"a..b\"", "scorers[0]:" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"targets\": []}]}", "{", "targets is empty" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"targets\": [\"rust\"]}]}", "{", "unknown target \"rust\"" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"model\": \"m.json\"}]}", "\"model\": \"m.json\"}", "\"model\" appears twice in scorers[0]" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"colour\": 1}]}", "\"colour\"", "unknown field \"colour\" in scorers[0]" },
        { Head + "\"scorers\": [{\"model\": \"m.json\"},\n{\"model\": \"m.json\", \"targets\": [\"csharp\", \"c\"]}]}", "\n{", "scorers[1] writes m.h in the same folder as scorers[0]" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"templates\": \"missing\"}]}", "\"missing\"", "folder not found" },
        { Head + "\"scorers\": [{\"model\": \"m.json\"}]} {}", "{}", "not valid JSON" },
        { Head + "\"scorers\": [{\"model\": \"m.json\"}], \"version\": 1}", "\"version\"", "\"version\" appears twice" },
        // firmware features (the compile options --alarm-filter, --stream, --explain)
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"alarm_filter\": \"6/5\"}]}", "\"6/5\"", "scorers[0].alarm_filter: alarm filter 6/5 is out of range" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"alarm_filter\": \"3/33\"}]}", "\"3/33\"", "alarm filter 3/33 is out of range" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"alarm_filter\": \"3 of 5\"}]}", "\"3 of 5\"", "is not K/N" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"stream\": 1}]}", "1}", "expected true or false for scorers[0].stream" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"explain\": \"yes\"}]}", "\"yes\"", "expected true or false for scorers[0].explain" },
        // a classifier: several models, priors, a name
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"], \"name\": \"c\", \"priors\": [1, 2, 3]}]}", "[1", "scorers[0].priors: 3 priors for 2 models" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"], \"name\": \"c\", \"priors\": [1, 0]}]}", "[1", "positive finite" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"], \"name\": \"c\", \"stream\": true}]}", "\"stream\"", "scorers[0].stream is for one model, not a classifier" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"], \"name\": \"c\", \"explain\": true}]}", "\"explain\"", "scorers[0].explain is for one model, not a classifier" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"], \"name\": \"c\", \"alarm_filter\": \"3/5\"}]}", "\"alarm_filter\"", "scorers[0].alarm_filter is for one model, not a classifier" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"]}]}", "{", "scorers[0] is a classifier and needs a name" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\"], \"name\": \"c\"}]}", "[\"m", "scorers[0].models lists 1 model" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"nope.json\"], \"name\": \"c\"}]}", "\"nope", "scorers[0].models[1]: file not found" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"models\": [\"m.json\", \"m.json\"], \"name\": \"c\"}]}", "{", "scorers[0] has both model and models" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"priors\": [1, 2]}]}", "\"priors\"", "scorers[0].priors applies to a classifier" },
        { Head + "\"scorers\": [{\"models\": [\"m.json\", \"m.json\"], \"name\": \"c\"},\n{\"model\": \"m.json\", \"name\": \"c_2\"}]}", "\n{", "scorers[1] writes c_2.h in the same folder as scorers[0]" },
        { Head + "\"scorers\": [{\"model\": \"m.json\", \"name\": \"c\", \"targets\": [\"c\"]},\n{\"model\": \"m.json\", \"name\": \"c\", \"targets\": [\"csharp\"]}]}", "\n{", "scorers[1] writes c.emit.json in the same folder as scorers[0]" },
    };

    /// <summary>Line and column (from 1) of the marked token, counted in the text.</summary>
    private static (int Line, int Column) Locate(string text, string at)
    {
        int second = text.IndexOf('\n') + 1;
        int offset = at switch
        {
            "^" => 0,
            "$" => Encoding.UTF8.GetByteCount(text),
            _ => text.IndexOf(at, second > 0 && text.IndexOf(at, second, StringComparison.Ordinal) >= 0 ? second : 0, StringComparison.Ordinal),
        };
        if (at == "\n{") offset++; // the entry on the next line
        Assert.True(offset >= 0, "marker not in the text: " + at);
        var before = text[..Math.Min(offset, text.Length)];
        int line = before.Count(ch => ch == '\n') + 1;
        return (line, offset - (before.LastIndexOf('\n') + 1) + 1);
    }

    [Theory]
    [MemberData(nameof(BadProjects))]
    public void Bad_projects_are_refused_with_file_line_and_column(string text, string at, string message)
    {
        var dir = FolderWithModel();
        var e = Assert.Throws<EmitException>(() => Parse(text, dir));
        Assert.Equal("p.json", e.File);
        Assert.Contains(message, e.Problem);
        if (at.Length > 0)
        {
            var (line, column) = Locate(text, at);
            Assert.Equal((line, column), ((int)e.Line!.Value, (int)e.Column!.Value));
        }
        Assert.DoesNotContain('\n', e.OneLine());
    }

    [Fact]
    public void Too_many_scorers_are_refused_at_the_first_one_too_many()
    {
        var dir = FolderWithModel();
        var entries = string.Join(",\n", Enumerable.Range(0, ProjectFile.MaxScorers + 1).Select(k => $"{{\"model\": \"m.json\", \"name\": \"s{k}\"}}"));
        var e = Assert.Throws<EmitException>(() => Parse(Head + "\"scorers\": [\n" + entries + "]}", dir));
        Assert.Contains($"more than {ProjectFile.MaxScorers} scorers", e.Problem);
        Assert.Equal(3 + ProjectFile.MaxScorers, e.Line);
    }

    [Fact]
    public void A_file_larger_than_the_limit_is_refused_before_it_is_read()
    {
        var dir = FolderWithModel();
        var path = Path.Combine(dir, "huge.json");
        using (var f = File.Create(path)) f.SetLength(ProjectFile.MaxFileBytes + 1); // sparse: nothing is written
        var e = Assert.Throws<EmitException>(() => ProjectFile.Read(path));
        Assert.Equal(path, e.File);
        Assert.Contains("more than a project file may be", e.Problem);
    }
}
