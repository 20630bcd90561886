using System.CommandLine;
using Emit.Quantize;

namespace Emit.Cli;

/// <summary>The fixed-point options shared by the commands that plan integer arithmetic (inspect, compile, verify).</summary>
public sealed class FixedPointOptionSet
{
    public readonly Option<string> Weights = new("--weights")
    {
        Description = "Fixed point: weight width (int8, int16, int32)",
        DefaultValueFactory = _ => "int16",
    };

    public readonly Option<string> Accumulator = new("--accumulator")
    {
        Description = "Fixed point: accumulator width (auto picks int32 whenever it is proved not to overflow and loses nothing)",
        DefaultValueFactory = _ => "auto",
    };

    public readonly Option<int> SoftplusTable = new("--softplus-table")
    {
        Description = "Fixed point: segments of the interpolated softplus table (a power of two, 8 to 65536)",
        DefaultValueFactory = _ => FixedPointOptions.DefaultTableSize,
    };

    public FixedPointOptionSet()
    {
        Weights.AcceptOnlyFromAmong("int8", "int16", "int32");
        Accumulator.AcceptOnlyFromAmong("auto", "int32", "int64");
    }

    public void AddTo(Command command)
    {
        command.Options.Add(Weights);
        command.Options.Add(Accumulator);
        command.Options.Add(SoftplusTable);
    }

    /// <summary>The first of these options given explicitly on the command line (not by its default), or null.</summary>
    public string? GivenOption(ParseResult parse)
    {
        foreach (var option in new Option[] { Weights, Accumulator, SoftplusTable })
            if (parse.GetResult(option) is { Implicit: false }) return option.Name;
        return null;
    }

    public FixedPointOptions Read(ParseResult parse)
    {
        var acc = parse.GetValue(Accumulator);
        var o = new FixedPointOptions(
            WeightTypeInfo.Parse(parse.GetValue(Weights)!) ?? WeightType.Int16,
            acc == "auto" ? null : AccumulatorTypeInfo.Parse(acc!),
            parse.GetValue(SoftplusTable));
        o.Validate();
        return o;
    }
}
