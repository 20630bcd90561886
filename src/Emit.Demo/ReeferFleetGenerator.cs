using Emit.Training;
using static Emit.Demo.ReeferFlag;

namespace Emit.Demo;

/// <summary>
/// Draws status reports of the invented reefer fleet: normal reports from the weighted operating modes
/// (<see cref="ReeferModes"/>) and faulty reports from the named faults (<see cref="ReeferFaults"/>).
/// Deterministic: the same seed gives the same reports on every platform and .NET version.
/// </summary>
public sealed class ReeferFleetGenerator
{
    /// <summary>Bumped whenever a recipe, probability, flag or the drawing order changes.</summary>
    public const int Version = 1;

    private readonly SplitMix64 _rng;

    /// <summary>A generator over its own SplitMix64 stream.</summary>
    public ReeferFleetGenerator(ulong seed) => _rng = new SplitMix64(seed);

    /// <summary>A normal report: a mode chosen by weight, then that mode's recipe.</summary>
    public ReeferRow NextNormal()
    {
        var mode = ChooseMode(ReeferModes.All.Select(m => m.Name));
        var v = new FlagVector(_rng);
        mode.Fill(v);
        SummariseAlarms(v);
        return new ReeferRow(v.ToImmutable(), mode.Name, null);
    }

    /// <summary>
    /// A faulty report: a fault chosen uniformly, a base mode by weight among the fault's, then the fault's recipe.
    /// </summary>
    public ReeferRow NextFaulty()
    {
        var fault = ReeferFaults.All[_rng.NextBelow(ReeferFaults.All.Length)];
        var mode = ChooseMode(fault.BaseModes);
        var v = new FlagVector(_rng);
        mode.Fill(v);
        fault.Apply(v);
        SummariseAlarms(v);
        return new ReeferRow(v.ToImmutable(), mode.Name, fault.Name);
    }

    private ReeferMode ChooseMode(IEnumerable<string> names)
    {
        var modes = names.Select(ReeferModes.Get).ToList();
        int pick = _rng.NextBelow(modes.Sum(m => m.Weight));
        foreach (var m in modes)
        {
            if (pick < m.Weight) return m;
            pick -= m.Weight;
        }
        throw new InvalidOperationException("unreachable: weights exhausted");
    }

    /// <summary>alarm_active is on exactly when one of the specific alarms is.</summary>
    private static void SummariseAlarms(FlagVector v) =>
        v[AlarmActive] = v[AlarmHighTemp] || v[AlarmLowTemp] || v[AlarmCompressor] || v[AlarmPower] ||
                         v[AlarmDoor] || v[AlarmDefrost] || v[AlarmSensor] || v[AlarmFan];
}
