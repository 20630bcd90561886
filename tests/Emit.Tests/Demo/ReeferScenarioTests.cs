using System.Collections.Immutable;
using Emit.Demo;
using static Emit.Demo.ReeferFlag;

namespace Emit.Tests.Demo;

/// <summary>
/// The invented scenario keeps its own rules (a demo specification, no outside source): flag names, modes that
/// never produce the combinations the faults produce, and the summary alarm flag.
/// </summary>
public sealed class ReeferScenarioTests
{
    private static bool On(ReeferRow r, ReeferFlag f) => r.Flags[(int)f] != 0;

    [Fact]
    public void Fifty_six_distinct_snake_case_names()
    {
        Assert.Equal(56, ReeferFlags.Count);
        Assert.Equal(56, ReeferFlags.Names.Distinct().Count());
        Assert.All(ReeferFlags.Names, n => Assert.Matches("^[a-z][a-z0-9]*(_[a-z0-9]+)*$", n));
        Assert.Equal("compressor_on", ReeferFlags.Names[0]);
        Assert.Equal("evaporator_fan_hi", ReeferFlags.Name(EvaporatorFanHi));
        Assert.Equal("in_transit", ReeferFlags.Names[^1]);
        Assert.Equal("power_genset", ReeferFlags.SnakeCase("PowerGenset"));
    }

    [Fact]
    public void Normal_reports_never_show_the_fault_signatures()
    {
        var g = new ReeferFleetGenerator(17);
        var rows = Enumerable.Range(0, 20000).Select(_ => g.NextNormal()).ToList();
        foreach (var r in rows)
        {
            Assert.False(On(r, EvaporatorFanHi) && On(r, EvaporatorFanLo), "both fan speeds");
            Assert.False(On(r, PowerShore) && On(r, PowerGenset), "two power sources");
            Assert.False(On(r, CompressorOn) && !On(r, PowerShore) && !On(r, PowerGenset), "compressor without power");
            Assert.True(On(r, SetpointFrozen) ^ On(r, SetpointChilled), "exactly one setpoint range");
            Assert.False(On(r, SetpointFrozen) && On(r, VentilationOpen), "ventilated frozen cargo");
            Assert.False(On(r, SupplyTempAboveSetpoint) && On(r, SupplyTempBelowSetpoint), "above and below");
            Assert.False(On(r, DefrostActive) && On(r, CompressorOn), "defrost with compressor");
            Assert.False(On(r, DefrostTimeout) || On(r, EvaporatorFanFault) || On(r, CondenserFanFault), "fault-only flags");
            bool anyAlarm = On(r, AlarmHighTemp) || On(r, AlarmLowTemp) || On(r, AlarmCompressor) || On(r, AlarmPower) ||
                            On(r, AlarmDoor) || On(r, AlarmDefrost) || On(r, AlarmSensor) || On(r, AlarmFan);
            Assert.Equal(anyAlarm, On(r, AlarmActive));
        }
        // Modes occur in proportion to their weights: within 4 binomial standard deviations.
        int total = ReeferModes.All.Sum(m => m.Weight);
        foreach (var m in ReeferModes.All)
        {
            double p = (double)m.Weight / total;
            int count = rows.Count(r => r.Mode == m.Name);
            Assert.InRange(count, rows.Count * p - 4 * Math.Sqrt(rows.Count * p * (1 - p)), rows.Count * p + 4 * Math.Sqrt(rows.Count * p * (1 - p)));
        }
    }

    [Fact]
    public void Each_fault_leaves_its_mark_on_a_base_mode_of_its_own()
    {
        var g = new ReeferFleetGenerator(18);
        var rows = Enumerable.Range(0, 4000).Select(_ => g.NextFaulty()).ToList();
        foreach (var f in ReeferFaults.All)
        {
            var mine = rows.Where(r => r.Fault == f.Name).ToList();
            Assert.True(mine.Count > 350, $"{f.Name}: {mine.Count} rows");
            Assert.All(mine, r => Assert.Contains(r.Mode, f.BaseModes));
        }
        Assert.All(rows.Where(r => r.Fault == "fan_speed_conflict"), r => Assert.True(On(r, EvaporatorFanHi) && On(r, EvaporatorFanLo)));
        Assert.All(rows.Where(r => r.Fault == "defrost_stuck"), r => Assert.True(On(r, DefrostTimeout) && !On(r, CompressorOn)));
        Assert.All(rows.Where(r => r.Fault == "frozen_cargo_ventilated"), r => Assert.True(On(r, SetpointFrozen) && On(r, VentilationOpen)));
        Assert.All(rows.Where(r => r.Fault == "door_open_compressor_running"), r => Assert.True(On(r, DoorOpen) && On(r, CompressorOn)));
        Assert.All(rows.Where(r => r.Fault == "power_source_conflict"),
            r => Assert.True(On(r, PowerShore) == On(r, PowerGenset), "both or neither power source"));
    }

    [Fact]
    public void Same_seed_same_reports()
    {
        ImmutableArray<byte>[] Draw(ulong seed)
        {
            var g = new ReeferFleetGenerator(seed);
            return Enumerable.Range(0, 50).Select(k => k % 5 == 0 ? g.NextFaulty().Flags : g.NextNormal().Flags).ToArray();
        }
        var a = Draw(3);
        var b = Draw(3);
        var c = Draw(4);
        Assert.True(a.Zip(b).All(p => p.First.SequenceEqual(p.Second)));
        Assert.False(a.Zip(c).All(p => p.First.SequenceEqual(p.Second)));
        Assert.Throws<ArgumentException>(() => ReeferModes.Get("no_such_mode"));
        Assert.Throws<ArgumentException>(() => ReeferFaults.Get("no_such_fault"));
    }
}
