namespace Emit.Project;

/// <summary>A project file read and checked: the scorers to generate, in the order the file lists them.</summary>
public sealed record EmitProject(string Path, IReadOnlyList<ProjectScorer> Scorers);
