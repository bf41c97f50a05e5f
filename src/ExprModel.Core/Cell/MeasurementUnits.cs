namespace ExprModel.Core.Cell;

/// <summary>
/// The one place where units of recorded and predicted values are read and converted: voltage (mV, V), current (pA, nA)
/// and current density (uA/cm2, converted into each other through <see cref="CurrentUnits"/> with a cell's area),
/// resistance (MOhm, GOhm), time (ms, s), rate (Hz), f-I gain (Hz/nA, Hz/pA, Hz per uA/cm2), rate of voltage change
/// (mV/ms = V/s) and dimensionless ratios (fraction, %, and the read-outs' own labels).
/// </summary>
public static class MeasurementUnits
{
    private static readonly Dictionary<string, MeasurementUnit> Known = Build();

    private static Dictionary<string, MeasurementUnit> Build()
    {
        // Case matters: mOhm is a milliohm, S a siemens, Pa a pascal; only spellings that name one unit are listed.
        var d = new Dictionary<string, MeasurementUnit>(StringComparer.Ordinal);
        void Add(Quantity q, double toBase, params string[] symbols)
        {
            foreach (var s in symbols) d[Normalise(s)] = new MeasurementUnit(symbols[0], q, toBase);
        }
        Add(Quantity.Voltage, 1, "mV", "millivolt", "millivolts");
        Add(Quantity.Voltage, 1000, "V", "volt", "volts");
        Add(Quantity.Current, 1, "pA", "picoampere", "picoamperes");
        Add(Quantity.Current, 1000, "nA", "nanoampere", "nanoamperes");
        Add(Quantity.CurrentDensity, 1, "uA/cm2", "µA/cm2", "µA/cm²", "uA/cm^2", "uA cm-2");
        Add(Quantity.Resistance, 1, "MOhm", "MΩ", "Mohm", "MOhms", "megaohm", "megaohms");
        Add(Quantity.Resistance, 1000, "GOhm", "GΩ", "Gohm", "GOhms", "gigaohm", "gigaohms");
        Add(Quantity.Time, 1, "ms", "msec", "millisecond", "milliseconds");
        Add(Quantity.Time, 1000, "s", "sec", "second", "seconds");
        Add(Quantity.Rate, 1, "Hz", "hz", "hertz", "spikes/s");
        Add(Quantity.RatePerCurrent, 1, "Hz/nA");
        Add(Quantity.RatePerCurrent, 1000, "Hz/pA");
        Add(Quantity.RatePerCurrentDensity, 1, "Hz per uA/cm2", "Hz/(uA/cm2)");
        // 1 V/s = 1000 mV / 1000 ms = 1 mV/ms.
        Add(Quantity.VoltageRate, 1, "mV/ms", "V/s");
        Add(Quantity.Dimensionless, 1, "fraction", "ratio", "1", "-", "0/1", "1 or 2", "last/first ISI", "mean normalised ISI change");
        Add(Quantity.Dimensionless, 0.01, "%", "percent");
        return d;
    }

    private static string Normalise(string s) => string.Join(' ', s.Trim().Split(' ', StringSplitOptions.RemoveEmptyEntries));

    /// <summary>The unit a text names, or null when it names none we know.</summary>
    public static MeasurementUnit? Parse(string? text) => text is not null && Known.TryGetValue(Normalise(text), out var u) ? u : null;

    /// <summary>The symbols understood, one per unit, for messages.</summary>
    public static string KnownSymbols => "mV, V, pA, nA, uA/cm2, MOhm, GOhm, ms, s, Hz, Hz/nA, Hz/pA, Hz per uA/cm2, mV/ms, V/s, fraction, %";

    /// <summary>True when a value in <paramref name="from"/> can be expressed in <paramref name="to"/>; current and current
    /// density only when <paramref name="withArea"/>.</summary>
    public static bool CanConvert(MeasurementUnit from, MeasurementUnit to, bool withArea) =>
        from.Quantity == to.Quantity || withArea && IsCurrentPair(from.Quantity, to.Quantity);

    /// <summary>Converts a value; current to current density and back needs the cell's membrane area.</summary>
    /// <exception cref="ArgumentException">The two units measure different quantities, or the area is missing.</exception>
    public static double Convert(double value, MeasurementUnit from, MeasurementUnit to, double? areaUm2 = null)
    {
        if (from.Quantity == to.Quantity) return value * from.ToBase / to.ToBase;
        if (!IsCurrentPair(from.Quantity, to.Quantity))
            throw new ArgumentException($"{from.Symbol} ({from.Quantity}) cannot be converted to {to.Symbol} ({to.Quantity}).");
        if (areaUm2 is not > 0) throw new ArgumentException($"Converting {from.Symbol} to {to.Symbol} needs the cell's membrane area.");
        var geometry = new Geometry { AreaUm2 = areaUm2.Value };
        return from.Quantity == Quantity.Current
            ? CurrentUnits.ToDensity(value * from.ToBase, CurrentUnit.Pa, geometry) / to.ToBase
            : CurrentUnits.FromDensity(value * from.ToBase, CurrentUnit.Pa, geometry) / to.ToBase;
    }

    private static bool IsCurrentPair(Quantity a, Quantity b) =>
        a == Quantity.Current && b == Quantity.CurrentDensity || a == Quantity.CurrentDensity && b == Quantity.Current;
}
