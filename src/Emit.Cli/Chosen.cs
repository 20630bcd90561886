namespace Emit.Cli;

/// <summary>
/// The value of a fixed-choice option (<see cref="CliOptions.Choice"/>) with the text it was given as.
/// </summary>
public sealed record Chosen<T>(string Text, T Value)
{
    /// <summary>The text, which is what --help prints as the default.</summary>
    public override string ToString() => Text;
}
