using Emit.Emission;

namespace Emit.Project;

/// <summary>
/// One entry of a project file: the model to compile (full path), the folder to write to (full path) and the options of
/// <c>emit compile</c>. <see cref="Line"/> is where the entry starts in the project file, for messages.
/// </summary>
public sealed record ProjectScorer(string ModelPath, string OutDirectory, CompileOptions Options, long Line);
