using Emit.Demo;

namespace Emit.Tests.Demo;

/// <summary>Builds the demo data once for all tests of a class (a second or two).</summary>
public sealed class DemoDataFixture
{
    public DemoDataFixture() => Data = DemoData.Build();

    public DemoDataSet Data { get; }

    /// <summary>The repository root: the nearest folder above the test binaries holding Emit.sln.</summary>
    public static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "Emit.sln"))) return dir.FullName;
        throw new InvalidOperationException("Emit.sln not found above " + AppContext.BaseDirectory);
    }
}
