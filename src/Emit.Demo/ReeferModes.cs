using System.Collections.Immutable;
using static Emit.Demo.ReeferFlag;

namespace Emit.Demo;

/// <summary>
/// The normal operating modes of the invented demo fleet. Probabilities are made up to look plausible, not
/// taken from any real equipment. Each recipe draws from the vector's random stream in a fixed order.
/// </summary>
public static class ReeferModes
{
    /// <summary>Every mode, in the order the generator weighs them.</summary>
    public static readonly ImmutableArray<ReeferMode> All = ImmutableArray.Create(
        new ReeferMode("pull_down", 10,
            "Cooling a freshly loaded container down to its setpoint: compressor at full capacity, fans up, " +
            "temperatures above setpoint.",
            PullDown),
        new ReeferMode("steady_chilled", 25,
            "Holding a chilled setpoint on shore or vessel power: compressor cycling and often unloaded, ventilation " +
            "and humidity control as set.",
            v =>
            {
                v[SetpointChilled] = true; ShorePower(v); Ambient(v); v.Draw(InTransit, 0.6); HoldChilled(v);
                Telemetry(v, 0.85, 0.9);
            }),
        new ReeferMode("steady_frozen", 25,
            "Holding a frozen setpoint on shore or vessel power: compressor mostly on with the economiser, fans at " +
            "low speed, vents closed.",
            v =>
            {
                v[SetpointFrozen] = true; ShorePower(v); Ambient(v); v.Draw(InTransit, 0.6); HoldFrozen(v);
                Telemetry(v, 0.85, 0.9);
            }),
        new ReeferMode("defrost_cycle", 8,
            "A timed evaporator defrost: compressor and fans stopped, defrost heater on until the coil reaches its " +
            "termination temperature.",
            Defrost),
        new ReeferMode("door_open_loading", 7,
            "Doors open at a depot while cargo is loaded or inspected: refrigeration mostly stopped, air above " +
            "setpoint.",
            DoorOpenLoading),
        new ReeferMode("genset_road_transit", 15,
            "On a truck chassis powered by a clip-on generator set, holding a chilled or frozen setpoint; weaker " +
            "remote link.",
            v =>
            {
                bool frozen = Setpoint(v, 0.5);
                GensetPower(v);
                Ambient(v);
                v[InTransit] = true;
                if (frozen) HoldFrozen(v); else HoldChilled(v);
                Telemetry(v, 0.35, 0.97);
            }),
        new ReeferMode("unpowered_transfer", 5,
            "Unplugged for a short move between stack, truck and vessel: no power, everything stopped, the logger on " +
            "its battery.",
            UnpoweredTransfer));

    /// <summary>The mode called <paramref name="name"/>.</summary>
    public static ReeferMode Get(string name) =>
        All.FirstOrDefault(m => m.Name == name) ?? throw new ArgumentException($"no mode \"{name}\"", nameof(name));

    private static void PullDown(FlagVector v)
    {
        bool frozen = Setpoint(v, 0.5);
        ShorePower(v);
        var ambient = Ambient(v);
        v.Draw(InTransit, 0.2);
        v[CompressorOn] = true;
        v[PulldownActive] = true;
        v.Draw(EconomizerValveOpen, frozen ? 0.8 : 0.2);
        if (frozen && v.Rng.Chance(0.3)) v[EvaporatorFanLo] = true; else v[EvaporatorFanHi] = true;
        v.Draw(CondenserFan, ambient == Weather.Cold ? 0.6 : 0.97);
        v.Draw(CompressorHighPressure, ambient == Weather.Hot ? 0.15 : 0.02);
        if (!frozen) v.Draw(VentilationOpen, 0.3);
        v.Draw(SupplyTempAboveSetpoint, 0.9);
        v[ReturnTempAboveSetpoint] = true;
        Telemetry(v, 0.8, 0.9);
    }

    private static void Defrost(FlagVector v)
    {
        bool frozen = Setpoint(v, 0.5);
        ShorePower(v);
        Ambient(v);
        v.Draw(InTransit, 0.5);
        v[DefrostActive] = true;
        if (!v.Draw(DefrostTerminationReached, 0.25)) v[DefrostHeaterOn] = true;
        if (!frozen)
        {
            v.Draw(VentilationOpen, 0.4);
            v.Draw(HumidityControl, 0.2);
        }
        if (!v.Draw(InRange, 0.6)) v.Draw(SupplyTempAboveSetpoint, 0.8);
        v.Draw(ReturnTempAboveSetpoint, 0.6);
        Telemetry(v, 0.85, 0.9);
    }

    private static void DoorOpenLoading(FlagVector v)
    {
        Setpoint(v, 0.5);
        ShorePower(v);
        Ambient(v);
        v.Draw(DoorOpen, 0.97);
        if (v.Draw(CompressorOn, 0.08))
        {
            v[CondenserFan] = true;
            v.Draw(EvaporatorFanHi, 0.5);
        }
        if (!v.Draw(SupplyTempAboveSetpoint, 0.7)) v.Draw(InRange, 0.8);
        v.Draw(ReturnTempAboveSetpoint, 0.85);
        v.Draw(AlarmDoor, 0.03);
        Telemetry(v, 0.9, 0.95);
    }

    private static void UnpoweredTransfer(FlagVector v)
    {
        bool frozen = Setpoint(v, 0.5);
        Ambient(v);
        v.Draw(InTransit, 0.7);
        if (!frozen) v.Draw(VentilationOpen, 0.5);
        if (!v.Draw(InRange, 0.85)) v.Draw(SupplyTempAboveSetpoint, 0.7);
        v.Draw(ReturnTempAboveSetpoint, 0.3);
        Telemetry(v, 0.15, 0.8, logger: 0.98);
    }

    /// <summary>Refrigeration while holding a chilled setpoint.</summary>
    internal static void HoldChilled(FlagVector v)
    {
        var ambient = CurrentWeather(v);
        if (v.Draw(CompressorOn, 0.55))
        {
            v.Draw(CapacityUnloaded, 0.6);
            v.Draw(EconomizerValveOpen, 0.05);
            v.Draw(CondenserFan, ambient == Weather.Cold ? 0.6 : 0.95);
            v.Draw(CompressorHighPressure, ambient == Weather.Hot ? 0.05 : 0.01);
        }
        else
        {
            v.Draw(HeaterOn, ambient == Weather.Cold ? 0.5 : 0.05);
            v.Draw(CondenserFan, 0.03);
        }
        if (v.Rng.Chance(0.85)) v[EvaporatorFanHi] = true; else v[EvaporatorFanLo] = true;
        if (!v.Draw(ControlledAtmosphere, 0.1)) v.Draw(VentilationOpen, 0.6);
        if (v.Draw(HumidityControl, 0.3) && v[CompressorOn]) v.Draw(DehumidifyActive, 0.6);
        Temperatures(v, inRange: 0.96, aboveWhenOut: 0.7, returnAbove: v[CompressorOn] ? 0.35 : 0.15);
        Nuisance(v);
    }

    /// <summary>Refrigeration while holding a frozen setpoint.</summary>
    internal static void HoldFrozen(FlagVector v)
    {
        var ambient = CurrentWeather(v);
        if (v.Draw(CompressorOn, 0.8))
        {
            v.Draw(EconomizerValveOpen, 0.6);
            v.Draw(CapacityUnloaded, 0.15);
            v.Draw(CondenserFan, ambient == Weather.Cold ? 0.6 : 0.95);
            v.Draw(CompressorHighPressure, ambient == Weather.Hot ? 0.05 : 0.01);
        }
        else v.Draw(CondenserFan, 0.03);
        if (v.Rng.Chance(0.9)) v[EvaporatorFanLo] = true; else v[EvaporatorFanHi] = true;
        Temperatures(v, inRange: 0.97, aboveWhenOut: 0.85, returnAbove: 0.3);
        Nuisance(v);
    }

    private static void Temperatures(FlagVector v, double inRange, double aboveWhenOut, double returnAbove)
    {
        if (!v.Draw(InRange, inRange))
        {
            if (v.Rng.Chance(aboveWhenOut))
            {
                v[SupplyTempAboveSetpoint] = true;
                v.Draw(AlarmHighTemp, 0.1);
            }
            else
            {
                v[SupplyTempBelowSetpoint] = true;
                v.Draw(AlarmLowTemp, 0.1);
            }
        }
        v.Draw(ReturnTempAboveSetpoint, returnAbove);
    }

    /// <summary>
    /// Rare harmless glitches that real logs also contain, so the model does not treat them as impossible.
    /// </summary>
    private static void Nuisance(FlagVector v)
    {
        if (v.Rng.Chance(0.006)) { v[AmbientSensorFault] = true; v[AlarmSensor] = true; }
        if (v[HumidityControl] && v.Rng.Chance(0.01)) { v[HumiditySensorFault] = true; v[AlarmSensor] = true; }
    }

    /// <summary>Chooses the setpoint range; returns true for frozen.</summary>
    private static bool Setpoint(FlagVector v, double frozen)
    {
        bool f = v.Rng.Chance(frozen);
        v[f ? SetpointFrozen : SetpointChilled] = true;
        return f;
    }

    private static void ShorePower(FlagVector v)
    {
        v[PowerShore] = true;
        v.Draw(VoltageLow, 0.01);
        v.Draw(VoltageHigh, 0.005);
    }

    private static void GensetPower(FlagVector v)
    {
        v[PowerGenset] = true;
        v[GensetRunning] = true;
        v.Draw(GensetLowFuel, 0.06);
        v.Draw(VoltageLow, 0.03);
    }

    private enum Weather { Mild, Hot, Cold }

    private static Weather Ambient(FlagVector v)
    {
        double u = v.Rng.NextDouble();
        if (u < 0.25) { v[AmbientHot] = true; return Weather.Hot; }
        if (u < 0.35) { v[AmbientCold] = true; return Weather.Cold; }
        return Weather.Mild;
    }

    private static Weather CurrentWeather(FlagVector v) =>
        v[AmbientHot] ? Weather.Hot : v[AmbientCold] ? Weather.Cold : Weather.Mild;

    private static void Telemetry(FlagVector v, double remoteLink, double gpsFix, double logger = 0.995)
    {
        v.Draw(LoggerRecording, logger);
        v.Draw(RemoteLinkUp, remoteLink);
        v.Draw(GpsFix, gpsFix);
    }
}
