namespace ExprModel.Core.Recordings;

/// <summary>
/// The one place where the units of recorded signals are turned into the units the read-outs use: membrane potential
/// in mV, current in pA, time in ms. NWB stores SI base units ("volts", "amperes", "seconds") with a conversion factor
/// (values in the base unit = data x conversion + offset); text tables state the unit in the column header.
/// </summary>
public static class SignalUnits
{
    /// <summary>Factor from the named voltage unit to mV, or null when the name is not a voltage unit.</summary>
    public static double? ToMillivolts(string unit) => Normalise(unit) switch
    {
        "v" or "volt" or "volts" => 1000,
        "mv" or "millivolt" or "millivolts" => 1,
        "uv" or "µv" or "microvolt" or "microvolts" => 1e-3,
        _ => null,
    };

    /// <summary>Factor from the named current unit to pA, or null when the name is not a current unit.</summary>
    public static double? ToPicoamps(string unit) => Normalise(unit) switch
    {
        "a" or "amp" or "amps" or "ampere" or "amperes" => 1e12,
        "na" or "nanoamp" or "nanoamps" or "nanoampere" or "nanoamperes" => 1000,
        "pa" or "picoamp" or "picoamps" or "picoampere" or "picoamperes" => 1,
        _ => null,
    };

    /// <summary>Factor from the named time unit to ms, or null when the name is not a time unit.</summary>
    public static double? ToMilliseconds(string unit) => Normalise(unit) switch
    {
        "s" or "sec" or "second" or "seconds" => 1000,
        "ms" or "millisecond" or "milliseconds" => 1,
        "us" or "µs" or "microsecond" or "microseconds" => 1e-3,
        _ => null,
    };

    /// <summary>What a column or attribute should say, for error messages.</summary>
    public const string VoltageUnits = "volts/V, mV";
    public const string CurrentUnits = "amperes/A, nA, pA";
    public const string TimeUnits = "seconds/s, ms";

    private static string Normalise(string unit) => unit.Trim().ToLowerInvariant();
}
