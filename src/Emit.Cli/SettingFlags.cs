namespace Emit.Cli;

/// <summary>
/// The command-line flag of each library <see cref="Setting"/>: how the CLI names settings in library messages.
/// </summary>
public static class SettingFlags
{
    public static string Render(Setting setting) => setting switch
    {
        Setting.Numeric => "--numeric",
        Setting.Weights => "--weights",
        Setting.Accumulator => "--accumulator",
        Setting.SoftplusTable => "--softplus-table",
        Setting.SelfTestVectors => "--selftest-vectors",
        Setting.Targets => "--target",
        Setting.Name => "--name",
        Setting.Method => "--method",
        Setting.CCompiler => "--cc",
        Setting.Force => "--force",
        _ => "--" + setting.Key().Replace('_', '-'),
    };
}
