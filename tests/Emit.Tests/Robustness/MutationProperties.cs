using System.Text;
using Emit.Model;
using Emit.Project;
using Emit.Vectors;
using FsCheck;
using FsCheck.Fluent;
using FsCheck.Xunit;

namespace Emit.Tests.Robustness;

/// <summary>One edit to a file's bytes.</summary>
public sealed record Mutation(int Kind, int Position, int Value)
{
    private static readonly string[] Tokens = ["", "{", "}", "[", "]", ",", ":", "\"", "-", "1e999", "NaN", "null", "0", "1", "2", "\n", "\r\n", "\uFEFF", "\\", "9999999999"];

    public byte[] Apply(byte[] bytes)
    {
        if (bytes.Length == 0) return bytes;
        int p = (int)((uint)Position % (uint)bytes.Length);
        switch (Kind)
        {
            case 0: return bytes[..p];                                                    // truncate
            case 1: { var b = bytes.ToArray(); b[p] ^= (byte)(1 << (Value % 8)); return b; } // flip a bit
            case 2: { var b = bytes.ToArray(); b[p] = (byte)Value; return b; }              // replace a byte
            case 3: return [.. bytes[..p], .. Encoding.UTF8.GetBytes(Tokens[Value % Tokens.Length]), .. bytes[p..]]; // insert a token
            case 4: return [.. bytes[..p], .. bytes[Math.Min(bytes.Length, p + 1 + Value % 16)..]];                 // delete a run
            default:                                                                        // edit a count: nudge a digit
            {
                var b = bytes.ToArray();
                for (int k = 0; k < b.Length; k++)
                {
                    int q = (p + k) % b.Length;
                    if (b[q] is >= (byte)'0' and <= (byte)'9') { b[q] = (byte)('0' + (b[q] - '0' + 1 + Value % 9) % 10); break; }
                }
                return b;
            }
        }
    }
}

public static class MutationArbitraries
{
    public static Arbitrary<Mutation[]> Mutations() =>
        Gen.Choose(0, 5).SelectMany(kind => Gen.Choose(0, int.MaxValue).SelectMany(pos => Gen.Choose(0, 255).Select(v => new Mutation(kind, pos, v))))
           .ArrayOf().Select(a => a.Take(6).ToArray()).ToArbitrary();
}

/// <summary>
/// mutated model, project and vector files (truncation, bit flips, replaced bytes, inserted tokens, deleted runs,
/// edited counts). The only outcomes allowed are a valid result or the tool's own error type with the file named.
/// </summary>
[Properties(Arbitrary = [typeof(MutationArbitraries)], MaxTest = 2000)]
public sealed class MutationProperties
{
    private static readonly byte[] ModelBytes = Encoding.UTF8.GetBytes(ModelJson.ToText(TestModels.Random(ModelKind.General, 5, 3, 2)) .Replace("\"hidden_links\"", "\"threshold\": 1.5, \"metadata\": {\"a\": [1, 2]}, \"hidden_links\""));

    private static readonly byte[] VectorBytes = Encoding.UTF8.GetBytes("a,b,c,d,e\n0,1,0,1,1\n1,1,1,0,0\n\n0,0,0,0,1\n");

    [Property]
    public bool Mutated_model_json_parses_or_fails_cleanly(Mutation[] edits)
    {
        var bytes = edits.Aggregate(ModelBytes, (b, m) => m.Apply(b));
        try
        {
            var model = ModelJson.Parse(bytes, "m.json");
            // A model that parses must also survive a round trip.
            return ModelJson.Parse(Encoding.UTF8.GetBytes(ModelJson.ToText(model)), "again.json").Sha256 == model.Sha256;
        }
        catch (EmitException e)
        {
            return e.File == "m.json" && !e.OneLine().Contains('\n');
        }
    }

    private static readonly string ProjectFolder = Emit.Tests.Project.ProjectFileTests.FolderWithModel();

    private static readonly byte[] ProjectBytes = Encoding.UTF8.GetBytes("""
        {
          "format": "emit.project",
          "version": 1,
          "scorers": [
            { "model": "m.json", "targets": ["c", "csharp"], "numeric": "f64", "name": "plant", "out": "gen/f64" },
            { "model": "m.json", "numeric": "fixed", "weights": "int8", "accumulator": "auto", "softplus_table": 512,
              "selftest_vectors": 4, "namespace": "Plant.Monitoring", "out": "gen/q" }
          ]
        }
        """);

    [Property]
    public bool Mutated_project_files_parse_or_fail_cleanly(Mutation[] edits)
    {
        var bytes = edits.Aggregate(ProjectBytes, (b, m) => m.Apply(b));
        try
        {
            var project = ProjectFile.Parse(bytes, "p.json", ProjectFolder);
            // What parses is usable: at least one scorer, each with a valid name, an existing model and known targets.
            return project.Scorers.Count > 0 && project.Scorers.All(s =>
                File.Exists(s.ModelPath) && s.Options.Targets.Count > 0 && System.Text.RegularExpressions.Regex.IsMatch(s.Options.Name, "^[A-Za-z_][A-Za-z0-9_]*$"));
        }
        catch (EmitException e)
        {
            return e.File == "p.json" && !e.OneLine().Contains('\n');
        }
    }

    private static readonly byte[][] NpzBytes =
    [
        File.ReadAllBytes(Path.Combine(AppContext.BaseDirectory, "Model", "Fixtures", "fmt_f8_le_c_stored.npz")),
        File.ReadAllBytes(Path.Combine(AppContext.BaseDirectory, "Model", "Fixtures", "fmt_f4_be_c_deflated.npz")),
    ];

    [Property]
    public bool Mutated_npz_archives_import_or_fail_cleanly(bool deflated, Mutation[] edits)
    {
        var bytes = edits.Aggregate(NpzBytes[deflated ? 1 : 0], (b, m) => m.Apply(b));
        try
        {
            return NpzModelReader.Read(new MemoryStream(bytes), "m.npz").Visible > 0;
        }
        catch (EmitException e)
        {
            return e.File == "m.npz";
        }
    }

    [Property]
    public bool Mutated_vector_files_read_or_fail_cleanly(Mutation[] edits)
    {
        var bytes = edits.Aggregate(VectorBytes, (b, m) => m.Apply(b));
        try
        {
            using var reader = new VectorReader(new MemoryStream(bytes), "v.csv", 5);
            var row = new byte[5];
            while (reader.TryRead(row))
                if (row.Any(u => u > 1)) return false;
            return true;
        }
        catch (EmitException e)
        {
            return e.File == "v.csv";
        }
    }
}
