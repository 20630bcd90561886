using System.Collections.Immutable;
using Emit.Cli;
using Emit.Model;
using Emit.Quantize;

namespace Emit.Tests.Cli;

/// <summary>Errors as docs/cli.md promises them: one line, exit 2 for bad input or usage, exit 3 for internal errors.</summary>
public sealed class UsageErrorTests
{
    private static string Model(ModelKind kind = ModelKind.Rbm, int visible = 4, int hidden = 2)
    {
        var path = Path.Combine(CliRunner.TempDir(), "m.json");
        ModelJson.WriteFile(TestModels.Random(kind, visible, hidden, 3), path, force: true);
        return path;
    }

    private static void AssertOneLineUsageError(CliRunner.Result r, string expected)
    {
        Assert.Equal(2, r.ExitCode);
        var lines = r.Error.TrimEnd('\n').Split('\n');
        Assert.Single(lines);
        Assert.StartsWith("emit: error: ", lines[0]);
        Assert.Contains(expected, lines[0]);
        Assert.DoesNotContain("System.", r.Error);
        Assert.DoesNotContain("   at ", r.Error);
    }

    [Theory]
    [InlineData("--count", "abc", "--count: 'abc' is not a whole number from 1 to")]
    [InlineData("--count", "1000000000000", "--count: '1000000000000' is not a whole number from 1 to")]
    [InlineData("--count", "0", "--count: '0' is not a whole number from 1 to")]
    [InlineData("--seed", "abc", "--seed: 'abc' is not a whole number from 0 to 18446744073709551615")]
    [InlineData("--burn-in", "-1", "--burn-in: '-1' is not a whole number from 0 to")]
    public void Bad_numbers_are_one_line_and_exit_2(string option, string value, string expected)
    {
        var args = new List<string> { "vectors", Model(), "-o", Path.Combine(CliRunner.TempDir(), "v.csv"), "--count", "5" };
        if (option == "--count") args.RemoveRange(4, 2);
        args.AddRange([option, value]);
        AssertOneLineUsageError(CliRunner.Run([.. args]), expected);
    }

    [Theory]
    [InlineData(new[] { "compile", "MODEL", "--numeric", "f16" }, "--numeric: 'f16' is not one of f32, f64, fixed (see emit compile --help)")]
    [InlineData(new[] { "compile", "MODEL", "--numeric", "fixed", "--weights", "int4" }, "--weights: 'int4' is not one of int8, int16, int32")]
    [InlineData(new[] { "compile", "MODEL", "--numeric", "fixed", "--accumulator", "int16" }, "--accumulator: 'int16' is not one of auto, int32, int64")]
    [InlineData(new[] { "compile", "MODEL", "--target", "c,java" }, "--target: 'java' is not one of c, csharp")]
    [InlineData(new[] { "logz", "MODEL", "--method", "guess" }, "--method: 'guess' is not one of exact, ais (see emit logz --help)")]
    [InlineData(new[] { "inspect", "MODEL", "--numeric", "f16" }, "--numeric: 'f16' is not one of f32, f64, fixed")]
    public void Fixed_choices_name_the_allowed_values(string[] args, string expected)
    {
        var model = Model();
        AssertOneLineUsageError(CliRunner.Run([.. args.Select(a => a == "MODEL" ? model : a)]), expected);
    }

    [Theory]
    [InlineData(new[] { "compil" }, "unknown command 'compil' (did you mean compile? see emit compile --help)")]
    [InlineData(new[] { "verfy" }, "unknown command 'verfy' (did you mean verify? see emit verify --help)")]
    [InlineData(new[] { "frobnicate" }, "unknown command 'frobnicate' (see emit --help)")]
    [InlineData(new[] { "compile", "MODEL", "--numerc", "f32" }, "unknown option '--numerc' (did you mean --numeric? see emit compile --help)")]
    [InlineData(new[] { "score", "MODEL", "-i", "x.csv", "--ouput", "y" }, "unknown option '--ouput' (did you mean --output? see emit score --help)")]
    [InlineData(new[] { "inspect", "MODEL", "--jsn" }, "unknown option '--jsn' (did you mean --json? see emit inspect --help)")]
    [InlineData(new string[0], "no command given (see emit --help)")]
    public void Mistyped_commands_and_options_get_a_suggestion_and_the_commands_own_help(string[] args, string expected)
    {
        var model = Model();
        AssertOneLineUsageError(CliRunner.Run([.. args.Select(a => a == "MODEL" ? model : a)]), expected);
    }

    [Fact]
    public void A_multi_line_parser_message_is_folded_onto_one_line()
    {
        // The text System.CommandLine 2.0 gives for a value outside AcceptOnlyFromAmong (its resource string
        // UnrecognizedArgument), which commands added later may still use.
        var folded = UsageErrors.Fold("Argument 'foo' not recognized. Must be one of:\n\t'exact'\n\t'ais'");
        Assert.Equal("Argument 'foo' not recognized. must be one of exact, ais", folded);
        Assert.Equal("--n: 'x' is not a whole number from -2147483648 to 2147483647",
            UsageErrors.Fold("Cannot parse argument 'x' for option '--n' as expected type 'System.Int32'."));
    }

    [Fact]
    public void A_missing_file_has_one_wording_for_models_data_and_projects()
    {
        var dir = CliRunner.TempDir();
        var missing = Path.Combine(dir, "nope.json");
        var model = Model();
        foreach (var args in new[]
                 {
                     new[] { "inspect", missing },
                     ["compile", missing],
                     ["build", missing],
                     ["diff", model, missing, "-i", "-"],
                     ["import", missing, "-o", Path.Combine(dir, "x.json")],
                 })
            AssertOneLineUsageError(CliRunner.Run(args), $"emit: error: {missing}: file not found (check the path)");
        var data = Path.Combine(dir, "nope.csv");
        AssertOneLineUsageError(CliRunner.Run("score", model, "-i", data), $"emit: error: {data}: file not found (check the path");
        var project = Path.Combine(dir, "p.json");
        File.WriteAllText(project, "{\"format\": \"emit.project\", \"version\": 1, \"scorers\": [{\"model\": \"gone.json\"}]}");
        AssertOneLineUsageError(CliRunner.Run("build", project), $"file not found: {Path.Combine(dir, "gone.json")} (check the path");
    }

    [Fact]
    public void An_argument_starting_with_at_is_a_file_name_not_a_response_file()
    {
        var dir = CliRunner.TempDir();
        var responses = Path.Combine(dir, "args.rsp");
        File.WriteAllText(responses, "--help\n");
        var r = CliRunner.Run("inspect", "@" + responses);
        AssertOneLineUsageError(r, $"@{responses}: file not found");
    }

    [Fact]
    public void An_internal_error_exits_3_with_one_line_and_the_trace_only_with_verbose()
    {
        var model = Model();
        var quiet = RunWithBrokenStdin("score", model, "-i", "-");
        Assert.Equal(3, quiet.ExitCode);
        Assert.Single(quiet.Error.TrimEnd('\n').Split('\n'));
        Assert.StartsWith("emit: internal error: the disk fell off", quiet.Error);
        Assert.Contains("run with --verbose", quiet.Error);

        var verbose = RunWithBrokenStdin("score", model, "-i", "-", "--verbose");
        Assert.Equal(3, verbose.ExitCode);
        Assert.Contains("emit: internal error: the disk fell off", verbose.Error);
        Assert.Contains("   at ", verbose.Error);
    }

    private static CliRunner.Result RunWithBrokenStdin(params string[] args)
    {
        var o = new StringWriter { NewLine = "\n" };
        var e = new StringWriter { NewLine = "\n" };
        int code = CliApp.Run(args, o, e, new BrokenStream());
        return new CliRunner.Result(code, o.ToString(), e.ToString());
    }

    /// <summary>Standard input whose read fails with an exception emit does not expect.</summary>
    private sealed class BrokenStream : MemoryStream
    {
        public override int Read(byte[] buffer, int offset, int count) => throw new InvalidOperationException("the disk fell off");
        public override int Read(Span<byte> buffer) => throw new InvalidOperationException("the disk fell off");
    }

    [Fact]
    public void Library_messages_name_settings_by_key_and_the_cli_by_flag()
    {
        var library = Assert.Throws<EmitException>(() => new FixedPointOptions(SoftplusTableSize: 100).Validate());
        Assert.StartsWith("softplus_table 100 is not allowed", library.OneLine());
        Assert.DoesNotContain("--", library.OneLine());
        var cli = CliRunner.Run("compile", Model(), "--numeric", "fixed", "--softplus-table", "100", "--out", CliRunner.TempDir());
        AssertOneLineUsageError(cli, "emit: error: --softplus-table 100 is not allowed");
    }

    [Fact]
    public void A_value_a_float_scorer_cannot_hold_names_the_model_file()
    {
        var m = TestModels.Random(ModelKind.Rbm, 3, 2, 1);
        var big = m.VisibleBias.ToArray();
        big[1] = 1e39;
        var path = Path.Combine(CliRunner.TempDir(), "big.json");
        ModelJson.WriteFile(new BoltzmannModel(m.Kind, 3, 2, [.. big], m.HiddenBias, m.Weights), path, force: true);
        var r = CliRunner.Run("compile", path, "--numeric", "f32", "--out", CliRunner.TempDir());
        AssertOneLineUsageError(r, $"emit: error: {path}: ");
        Assert.Contains("does not fit in a 32-bit float (use --numeric f64)", r.Error);
    }

    [Fact]
    public void A_general_model_too_large_for_fixed_point_names_the_model_file()
    {
        var path = Model(ModelKind.General, visible: 3, hidden: 17);
        var r = CliRunner.Run("inspect", path, "--numeric", "fixed");
        AssertOneLineUsageError(r, $"emit: error: {path}: ");
        Assert.Contains("2^17 hidden states", r.Error);
        var c = CliRunner.Run("compile", path, "--numeric", "fixed", "--out", CliRunner.TempDir());
        AssertOneLineUsageError(c, $"emit: error: {path}: ");
        Assert.Contains("2^17 hidden states", c.Error);
    }

    [Fact]
    public void Control_characters_from_a_model_never_reach_the_terminal()
    {
        var dir = CliRunner.TempDir();
        var path = Path.Combine(dir, "evil.json");
        // A model whose kind is an xterm title-setting sequence (ESC ] 0 ; ... BEL), as a hostile file would carry.
        File.WriteAllText(path, "{\"format\": \"emit.model\", \"version\": 1, \"kind\": \"\\u001b]0;pwned\\u0007\\u000b\\u2028\\u0085\\u0000\"}");
        var r = CliRunner.Run("inspect", path);
        Assert.Equal(2, r.ExitCode);
        foreach (var c in "\u001b\u0007\u000b\u2028\u0085\u0000")
        {
            Assert.DoesNotContain(c, r.Error);
            Assert.DoesNotContain(c, r.Out);
        }
        Assert.Contains("<U+001B>", r.Error);

        // Unit names with control characters, echoed by diff's renamed-unit notes.
        var m = TestModels.Random(ModelKind.Rbm, 2, 1, 5);
        var a = Path.Combine(dir, "a.json");
        var b = Path.Combine(dir, "b.json");
        ModelJson.WriteFile(new BoltzmannModel(m.Kind, 2, 1, m.VisibleBias, m.HiddenBias, m.Weights, names: ImmutableArray.Create("x", "y")), a, force: true);
        ModelJson.WriteFile(new BoltzmannModel(m.Kind, 2, 1, m.VisibleBias, m.HiddenBias, m.Weights, names: ImmutableArray.Create("x", "\u001b[2Jy\u2029")), b, force: true);
        var d = CliRunner.RunWithInput("0,1\n", "diff", a, b, "-i", "-");
        Assert.Equal(0, d.ExitCode);
        Assert.DoesNotContain('\u001b', d.Out);
        Assert.DoesNotContain('\u2029', d.Out);
        Assert.Contains("<U+001B>[2Jy<U+2029>", d.Out);
    }

    [Fact]
    public void Terminal_text_escapes_what_a_terminal_acts_on_and_keeps_the_rest()
    {
        // ECMA-48: C0 controls (00-1F), DEL, C1 controls (80-9F); Unicode: LS/PS (2028/2029) and bidi overrides.
        Assert.Equal("a<U+001B>b<U+0007><U+000B><U+000D><U+007F><U+0085><U+009B><U+2028><U+202E>\tz\n",
            TerminalText.Safe("a\u001bb\u0007\u000b\r\u007f\u0085\u009b\u2028\u202e\tz\n"));
        Assert.Equal("Schütze ✓ 温度", TerminalText.Safe("Schütze ✓ 温度"));
    }
}
