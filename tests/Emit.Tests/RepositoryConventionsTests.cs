using System.Text;
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

    /// <summary>C# files under <paramref name="root"/>, leaving out build output (bin/, obj/).</summary>
    private static IEnumerable<string> SourceFiles(string root) =>
        Directory.EnumerateFiles(root, "*.cs", SearchOption.AllDirectories)
            .Where(f => !Path.GetRelativePath(root, f).Split(Path.DirectorySeparatorChar)
                .Any(part => part is "bin" or "obj"))
            .Order(StringComparer.Ordinal);

    private static int Runes(string line) => line.EnumerateRunes().Count();
}
