namespace Emit.Harness;

/// <summary>What a harness needs to run a generated classifier beside its first model's scorer.</summary>
/// <param name="Name">The classifier's C name (NAME_classify, NAME.h).</param>
/// <param name="ClassName">The classifier's C# class, fully qualified.</param>
/// <param name="Models">Number of models.</param>
/// <param name="CSharpType">The C# type of a score (float, double, int, long).</param>
public sealed record ClassifierHarness(string Name, string ClassName, int Models, string CSharpType);
