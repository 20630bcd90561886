using System.Collections.Immutable;
using static Emit.Demo.ReeferFlag;

namespace Emit.Demo;

/// <summary>
/// The named faults of the invented demo fleet. Each recipe takes a normal report from one of its base modes
/// and changes the flags the fault would change; some are blatant, some (sensor flicker, ventilated frozen
/// cargo) touch only a few flags, so the demo shows both what the detector catches and what it may miss.
/// </summary>
public static class ReeferFaults
{
    private static readonly ImmutableArray<string> Holding = ImmutableArray.Create("steady_chilled", "steady_frozen",
        "genset_road_transit");
    private static readonly ImmutableArray<string> Running = Holding.Add("pull_down");

    /// <summary>Every fault, in the order the generator chooses among them (uniformly).</summary>
    public static readonly ImmutableArray<ReeferFault> All = ImmutableArray.Create(
        new ReeferFault("door_open_compressor_running",
            "Doors left open for long while the unit keeps cooling at full capacity: warm air, fans running, door " +
            "alarm often raised.",
            Holding, DoorOpenCompressorRunning),
        new ReeferFault("defrost_stuck",
            "A defrost that does not end: heater on past its time limit, refrigeration stopped, temperatures rising.",
            Holding, DefrostStuck),
        new ReeferFault("evaporator_fan_failure",
            "Evaporator fans stopped while the compressor runs: no air over the cargo, high temperature alarm, low " +
            "suction pressure.",
            Running, EvaporatorFanFailure),
        new ReeferFault("condenser_fan_failure",
            "Condenser fan stopped while the compressor runs: high discharge pressure, compressor alarms.",
            Running, CondenserFanFailure),
        new ReeferFault("power_source_conflict",
            "Contradictory power flags: shore and generator power both reported, or neither while the compressor runs.",
            Running.Add("defrost_cycle"), PowerSourceConflict),
        new ReeferFault("sensor_flicker",
            "A loose sensor connector: temperature and sensor flags flip at random, supply air reported both above " +
            "and below the band.",
            Holding, SensorFlicker),
        new ReeferFault("frozen_cargo_ventilated",
            "Fresh-air ventilation left open (often with humidity control) on a frozen setpoint: a settings error " +
            "that touches one or two flags.",
            ImmutableArray.Create("steady_frozen"), FrozenCargoVentilated),
        new ReeferFault("fan_speed_conflict",
            "Evaporator fans reported at high and low speed at once (a relay or wiring fault).",
            Running, FanSpeedConflict));

    /// <summary>The fault called <paramref name="name"/>.</summary>
    public static ReeferFault Get(string name) =>
        All.FirstOrDefault(f => f.Name == name) ?? throw new ArgumentException($"no fault \"{name}\"", nameof(name));

    private static void DoorOpenCompressorRunning(FlagVector v)
    {
        v[DoorOpen] = true;
        v[CompressorOn] = true;
        v[CondenserFan] = true;
        v.Clear(CapacityUnloaded, HeaterOn, InRange, SupplyTempBelowSetpoint);
        if (!v[EvaporatorFanHi] && !v[EvaporatorFanLo]) v[EvaporatorFanHi] = true;
        v[SupplyTempAboveSetpoint] = true;
        v[ReturnTempAboveSetpoint] = true;
        v.Draw(AlarmDoor, 0.6);
        v.Draw(AlarmHighTemp, 0.3);
    }

    private static void DefrostStuck(FlagVector v)
    {
        v.Clear(CompressorOn, EconomizerValveOpen, CapacityUnloaded, DehumidifyActive, HeaterOn,
            EvaporatorFanHi, EvaporatorFanLo, CondenserFan, CompressorHighPressure, DefrostTerminationReached,
            InRange, SupplyTempBelowSetpoint, AlarmLowTemp);
        v[DefrostActive] = true;
        v[DefrostHeaterOn] = true;
        v[DefrostTimeout] = true;
        v[SupplyTempAboveSetpoint] = true;
        v[ReturnTempAboveSetpoint] = true;
        v.Draw(AlarmDefrost, 0.7);
        v.Draw(AlarmHighTemp, 0.5);
    }

    private static void EvaporatorFanFailure(FlagVector v)
    {
        v[CompressorOn] = true;
        v.Clear(EvaporatorFanHi, EvaporatorFanLo, InRange, SupplyTempBelowSetpoint, AlarmLowTemp, HeaterOn);
        bool tripped = v.Draw(EvaporatorFanFault, 0.7);
        v.Draw(AlarmFan, tripped ? 0.9 : 0.2);
        v[AlarmHighTemp] = true;
        v.Draw(CompressorLowPressure, 0.6);
        v[SupplyTempAboveSetpoint] = true;
        v[ReturnTempAboveSetpoint] = true;
    }

    private static void CondenserFanFailure(FlagVector v)
    {
        v[CompressorOn] = true;
        v.Clear(CondenserFan, HeaterOn);
        bool tripped = v.Draw(CondenserFanFault, 0.6);
        v.Draw(AlarmFan, tripped ? 0.8 : 0.1);
        v[CompressorHighPressure] = true;
        v.Draw(CompressorOverheat, 0.4);
        v.Draw(AlarmCompressor, 0.7);
        if (!v.Draw(InRange, 0.5))
        {
            v[SupplyTempBelowSetpoint] = false;
            v[SupplyTempAboveSetpoint] = true;
        }
    }

    private static void PowerSourceConflict(FlagVector v)
    {
        if (v.Rng.Chance(0.6))
        {
            v[PowerShore] = true;
            v[PowerGenset] = true;
            v.Draw(GensetRunning, 0.5);
        }
        else
        {
            v.Clear(PowerShore, PowerGenset, GensetRunning, GensetLowFuel, DefrostActive, DefrostHeaterOn,
                DefrostTerminationReached);
            v[CompressorOn] = true;
            v[CondenserFan] = true;
        }
        v.Draw(PhaseSequenceError, 0.15);
        v.Draw(AlarmPower, 0.3);
    }

    private static void SensorFlicker(FlagVector v)
    {
        ReadOnlySpan<ReeferFlag> flaky =
        [
            SupplyTempAboveSetpoint, SupplyTempBelowSetpoint, ReturnTempAboveSetpoint, InRange,
            SupplySensorFault, ReturnSensorFault, AmbientSensorFault, AmbientHot, AmbientCold,
        ];
        if (v.Rng.Chance(0.5))
        {
            v[SupplyTempAboveSetpoint] = true;
            v[SupplyTempBelowSetpoint] = true;
        }
        int flips = 2 + v.Rng.NextBelow(3);
        Span<bool> used = stackalloc bool[flaky.Length];
        for (int n = 0; n < flips; n++)
        {
            int k;
            do k = v.Rng.NextBelow(flaky.Length); while (used[k]);
            used[k] = true;
            v[flaky[k]] = !v[flaky[k]];
        }
        v.Draw(AlarmSensor, 0.3);
    }

    private static void FrozenCargoVentilated(FlagVector v)
    {
        v[VentilationOpen] = true;
        v.Draw(HumidityControl, 0.4);
    }

    private static void FanSpeedConflict(FlagVector v)
    {
        v[EvaporatorFanHi] = true;
        v[EvaporatorFanLo] = true;
        if (v.Draw(EvaporatorFanFault, 0.2)) v[AlarmFan] = true;
    }
}
