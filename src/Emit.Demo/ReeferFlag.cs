namespace Emit.Demo;

/// <summary>
/// The 56 binary status flags a refrigerated container ("reefer") of the invented demo fleet reports, in
/// column order. The flag's name in files is the snake_case form of the member (see <see cref="ReeferFlags"/>).
/// </summary>
public enum ReeferFlag
{
    // Refrigeration circuit
    /// <summary>Compressor motor running.</summary>
    CompressorOn,
    /// <summary>Discharge pressure above its switch point.</summary>
    CompressorHighPressure,
    /// <summary>Suction pressure below its switch point.</summary>
    CompressorLowPressure,
    /// <summary>Compressor motor current above its limit.</summary>
    CompressorOvercurrent,
    /// <summary>Compressor discharge temperature above its limit.</summary>
    CompressorOverheat,
    /// <summary>Economiser (vapour injection) valve open, used for capacity at frozen setpoints.</summary>
    EconomizerValveOpen,
    /// <summary>Compressor running unloaded (reduced capacity) to hold a chilled setpoint.</summary>
    CapacityUnloaded,
    /// <summary>Electric heater on to hold a chilled setpoint in cold weather.</summary>
    HeaterOn,

    // Defrost
    /// <summary>A defrost cycle is in progress.</summary>
    DefrostActive,
    /// <summary>Evaporator defrost heater energised.</summary>
    DefrostHeaterOn,
    /// <summary>Coil reached its defrost termination temperature.</summary>
    DefrostTerminationReached,
    /// <summary>Defrost ended on its time limit instead of on temperature.</summary>
    DefrostTimeout,

    // Fans
    /// <summary>Evaporator fans at high speed.</summary>
    EvaporatorFanHi,
    /// <summary>Evaporator fans at low speed.</summary>
    EvaporatorFanLo,
    /// <summary>Condenser fan running.</summary>
    CondenserFan,
    /// <summary>Evaporator fan motor protection tripped.</summary>
    EvaporatorFanFault,
    /// <summary>Condenser fan motor protection tripped.</summary>
    CondenserFanFault,

    // Door
    /// <summary>Cargo door open (door switch).</summary>
    DoorOpen,
    /// <summary>Door switch reading implausible.</summary>
    DoorSwitchFault,

    // Power
    /// <summary>Running on shore or vessel mains.</summary>
    PowerShore,
    /// <summary>Running on a clip-on generator set.</summary>
    PowerGenset,
    /// <summary>Generator set engine running.</summary>
    GensetRunning,
    /// <summary>Generator set fuel low.</summary>
    GensetLowFuel,
    /// <summary>Supply voltage below its band.</summary>
    VoltageLow,
    /// <summary>Supply voltage above its band.</summary>
    VoltageHigh,
    /// <summary>Three-phase supply in the wrong sequence.</summary>
    PhaseSequenceError,

    // Control
    /// <summary>Setpoint in the frozen range.</summary>
    SetpointFrozen,
    /// <summary>Setpoint in the chilled range.</summary>
    SetpointChilled,
    /// <summary>Pull-down (initial cool-down to setpoint) in progress.</summary>
    PulldownActive,
    /// <summary>Supply temperature within the in-range band around the setpoint.</summary>
    InRange,
    /// <summary>Humidity control enabled.</summary>
    HumidityControl,
    /// <summary>Dehumidification currently active.</summary>
    DehumidifyActive,
    /// <summary>Fresh-air ventilation opening open.</summary>
    VentilationOpen,
    /// <summary>Controlled-atmosphere system active.</summary>
    ControlledAtmosphere,

    // Temperatures
    /// <summary>Supply air warmer than the in-range band.</summary>
    SupplyTempAboveSetpoint,
    /// <summary>Supply air colder than the in-range band.</summary>
    SupplyTempBelowSetpoint,
    /// <summary>Return air warmer than the setpoint band.</summary>
    ReturnTempAboveSetpoint,
    /// <summary>Ambient hot (tropical).</summary>
    AmbientHot,
    /// <summary>Ambient cold (winter).</summary>
    AmbientCold,

    // Sensors
    /// <summary>Supply air sensor reading implausible.</summary>
    SupplySensorFault,
    /// <summary>Return air sensor reading implausible.</summary>
    ReturnSensorFault,
    /// <summary>Ambient sensor reading implausible.</summary>
    AmbientSensorFault,
    /// <summary>Humidity sensor reading implausible.</summary>
    HumiditySensorFault,

    // Alarms
    /// <summary>Any alarm is active (summary of the alarm_* flags below).</summary>
    AlarmActive,
    /// <summary>High temperature alarm.</summary>
    AlarmHighTemp,
    /// <summary>Low temperature alarm.</summary>
    AlarmLowTemp,
    /// <summary>Compressor alarm.</summary>
    AlarmCompressor,
    /// <summary>Power supply alarm.</summary>
    AlarmPower,
    /// <summary>Door open too long alarm.</summary>
    AlarmDoor,
    /// <summary>Defrost alarm.</summary>
    AlarmDefrost,
    /// <summary>Sensor alarm.</summary>
    AlarmSensor,
    /// <summary>Fan alarm.</summary>
    AlarmFan,

    // Telemetry
    /// <summary>Data logger recording.</summary>
    LoggerRecording,
    /// <summary>Remote monitoring link up.</summary>
    RemoteLinkUp,
    /// <summary>Position fix available.</summary>
    GpsFix,
    /// <summary>Container in transit (on a vessel, truck or train).</summary>
    InTransit,
}
