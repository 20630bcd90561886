using System.CommandLine;
using Emit.Quantize;

namespace Emit.Cli;

/// <summary>
/// The fixed-point options shared by the commands that plan integer arithmetic (inspect, compile, verify).
/// </summary>
public sealed class FixedPointOptionSet
{
    public Option<Chosen<WeightType>> Weights { get; } = CliOptions.Choice(
        "--weights", "Fixed point: weight width",
        [("int8", WeightType.Int8), ("int16", WeightType.Int16), ("int32", WeightType.Int32)], "int16");

    public Option<Chosen<AccumulatorType?>> Accumulator { get; } = CliOptions.Choice<AccumulatorType?>(
        "--accumulator",
        "Fixed point: accumulator width (auto picks int32 whenever it is proved not to overflow and loses nothing)",
        [("auto", null), ("int32", AccumulatorType.Int32), ("int64", AccumulatorType.Int64)], "auto");

    public Option<int> SoftplusTable { get; } = CliOptions.Number(
        "--softplus-table",
        $"Fixed point: segments of the interpolated softplus table (a power of two, {FixedPointOptions.MinTableSize} " +
        $"to {FixedPointOptions.MaxTableSize})",
        1, int.MaxValue, FixedPointOptions.DefaultTableSize);

    public void AddTo(Command command)
    {
        command.Options.Add(Weights);
        command.Options.Add(Accumulator);
        command.Options.Add(SoftplusTable);
    }

    /// <summary>
    /// The first of these options given explicitly on the command line (not by its default), or null.
    /// </summary>
    public string? GivenOption(ParseResult parse)
    {
        foreach (var option in new Option[] { Weights, Accumulator, SoftplusTable })
            if (parse.GetResult(option) is { Implicit: false }) return option.Name;
        return null;
    }

    public FixedPointOptions Read(ParseResult parse)
    {
        var o = new FixedPointOptions(parse.GetValue(Weights)!.Value, parse.GetValue(Accumulator)!.Value,
            parse.GetValue(SoftplusTable));
        o.Validate();
        return o;
    }
}
