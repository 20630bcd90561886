using System.Text;
using System.Xml.Linq;
using Emit.Tests.Demo;

namespace Emit.Tests;

/// <summary>
/// Conventions of the sources that a compiler does not check. The line limit is the one the repository's
/// .editorconfig states (max_line_length = 120 for C#), counted in characters: Unicode scalar values (runes), so
/// "×" or "Δ" count one, as an editor's column does for them.
/// </summary>
public sealed class RepositoryConventionsTests
{
    private const int MaxLineLength = 120;

    [Fact]
    public void Every_line_of_the_library_and_CLI_sources_fits_in_120_characters()
    {
        var src = Path.Combine(DemoDataFixture.RepositoryRoot(), "src");
        var files = SourceFiles(src).ToList();
        Assert.NotEmpty(files);
        var tooLong = new List<string>();
        foreach (var file in files)
        {
            var lines = File.ReadAllLines(file, Encoding.UTF8);
            for (int i = 0; i < lines.Length; i++)
            {
                int length = Runes(lines[i]);
                if (length > MaxLineLength)
                    tooLong.Add($"{Path.GetRelativePath(src, file)}:{i + 1}: {length} characters");
            }
        }
        Assert.True(tooLong.Count == 0,
            $"{tooLong.Count} line(s) longer than {MaxLineLength} characters:\n" + string.Join("\n", tooLong));
    }

    [Theory]
    [InlineData("", 0)]
    [InlineData("abc", 3)]
    [InlineData("ΔF ± 1 × 2", 10)]
    [InlineData("\U0001F600x", 2)]   // one rune outside the BMP is two UTF-16 chars but one character
    public void Characters_are_counted_as_runes(string text, int expected) => Assert.Equal(expected, Runes(text));

    /// <summary>
    /// Every public type of the core library has a non-empty summary in the documentation file the build writes
    /// beside Emit.Core.dll. (The compiler's CS1591, an error in that project, only asks for some comment on every
    /// public type and member; this asks for a summary saying what the type is.)
    /// </summary>
    [Fact]
    public void Every_public_type_of_the_core_library_has_a_summary()
    {
        var assembly = typeof(EmitException).Assembly;
        var xmlPath = Path.ChangeExtension(assembly.Location, ".xml");
        Assert.True(File.Exists(xmlPath), $"no documentation file {xmlPath}");
        var summaries = XDocument.Load(xmlPath).Descendants("member")
            .Where(m => ((string?)m.Attribute("name"))?.StartsWith("T:", StringComparison.Ordinal) == true)
            .ToDictionary(m => ((string)m.Attribute("name")!)[2..], m => m.Element("summary"));
        var types = assembly.GetExportedTypes();
        Assert.True(types.Length > 100, $"only {types.Length} exported types: is this the core library?");
        var missing = types
            .Select(t => t.FullName!.Replace('+', '.'))
            .Where(name => !summaries.TryGetValue(name, out var summary) || summary is null
                || (summary.Value.Trim().Length == 0 && !summary.HasElements))
            .Order(StringComparer.Ordinal)
            .ToList();
        Assert.True(missing.Count == 0, "public types without a summary:\n" + string.Join("\n", missing));
    }

    /// <summary>C# files under <paramref name="root"/>, leaving out build output (bin/, obj/).</summary>
    private static IEnumerable<string> SourceFiles(string root) =>
        Directory.EnumerateFiles(root, "*.cs", SearchOption.AllDirectories)
            .Where(f => !Path.GetRelativePath(root, f).Split(Path.DirectorySeparatorChar)
                .Any(part => part is "bin" or "obj"))
            .Order(StringComparer.Ordinal);

    private static int Runes(string line) => line.EnumerateRunes().Count();
}
