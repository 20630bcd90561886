using System.Globalization;
using Emit.Model;
using Emit.Tests.Cli;

namespace Emit.Tests.Robustness;

/// <summary>output bytes do not depend on the culture (de-DE writes 1,5 for 1.5).</summary>
public sealed class CultureTests
{
    private static T InCulture<T>(string name, Func<T> f)
    {
        var (c, ui) = (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture);
        try
        {
            CultureInfo.CurrentCulture = CultureInfo.CurrentUICulture = new CultureInfo(name);
            return f();
        }
        finally
        {
            (CultureInfo.CurrentCulture, CultureInfo.CurrentUICulture) = (c, ui);
        }
    }

    [Fact]
    public void Model_text_inspect_score_and_vectors_are_the_same_in_a_comma_decimal_culture()
    {
        var m = TestModels.Random(ModelKind.Lateral, 6, 4, 3).With(1.25, new LogPartition(3.5, "exact", 0));
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        File.WriteAllText(Path.Combine(dir, "v.csv"), "0,1,1,0,1,0\n1,1,1,1,1,1\n");
        string[] Run() =>
        [
            ModelJson.ToText(m),
            CliRunner.Run("inspect", model, "--json").Out,
            CliRunner.Run("inspect", model).Out,
            CliRunner.Run("score", model, "--input", Path.Combine(dir, "v.csv")).Out,
            CliRunner.Run("logz", model, "--json").Out.Split("\"seconds\"")[0],
        ];
        var invariant = InCulture("en-US", Run);
        var german = InCulture("de-DE", Run);
        Assert.Equal("1,5", InCulture("de-DE", () => 1.5.ToString()));  // the culture really writes a decimal comma
        Assert.Equal(invariant, german);
        Assert.Contains("1.25", invariant[0]);
    }

    [Fact]
    public void Calibrate_and_explain_read_and_write_the_same_numbers_in_a_comma_decimal_culture()
    {
        var m = TestModels.Random(ModelKind.Rbm, 5, 3, 4);
        var dir = CliRunner.TempDir();
        var model = Path.Combine(dir, "m.json");
        ModelJson.WriteFile(m, model, force: true);
        var data = Path.Combine(dir, "v.csv");
        File.WriteAllLines(data, Enumerable.Range(0, 32).Select(b => string.Join(",", TestModels.Bits(b, 5))));
        string[] Run() =>
        [
            CliRunner.Run("calibrate", model, "--normal", data, "--false-alarm", "0.25", "--anomalies", data, "--alarm-filter", "2/3",
                "--sample-period", "1.5h", "--json").Out,
            CliRunner.Run("calibrate", model, "--normal", data, "--false-alarm", "0.25", "--anomalies", data).Out,
            CliRunner.Run("calibrate", model, "--normal", data, "--alarm-filter", "1/1", "--sample-period", "1h", "--target-alarms-per-day", "2.5").Out,
            CliRunner.Run("explain", model, "--input", data).Out,
        ];
        var invariant = InCulture("en-US", Run);
        var german = InCulture("de-DE", Run);
        Assert.Equal(invariant, german);
        Assert.Contains("\"false_alarm\": 0.25", invariant[0]);
        Assert.Contains("at most 2.5 alarms per day", invariant[2]);
    }
}
