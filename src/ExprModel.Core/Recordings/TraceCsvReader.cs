using System.Globalization;
using System.Text.RegularExpressions;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Expression.Text;

namespace ExprModel.Core.Recordings;

/// <summary>
/// Reads current-clamp sweeps from plain text tables (comma, tab or semicolon): a time column, a membrane potential
/// column and a command current column, each with its unit in the header (<c>time (ms)</c> or <c>(s)</c>,
/// <c>V (mV)</c> or <c>(V)</c>, <c>I (pA)</c> or <c>(nA)</c>); either one file per sweep, or one long table with a
/// <c>sweep</c> column. Time must rise by a constant step (within 1 %) within a sweep. Errors name file, line and column.
/// </summary>
public static partial class TraceCsvReader
{
    private const long MaxBytes = 2L << 30;

    private static readonly string[] TimeNames = ["time", "t"];
    private static readonly string[] VoltageNames = ["v", "vm", "voltage", "membrane potential", "membrane_potential"];
    private static readonly string[] CurrentNames = ["i", "current", "command", "command current", "command_current", "stimulus"];
    private static readonly string[] SweepNames = ["sweep", "sweep number", "sweep_number"];

    /// <summary>The last whole number in a file name ("cell3_sweep_07.csv" is sweep 7).</summary>
    [GeneratedRegex(@"(\d+)(?!.*\d)")]
    private static partial Regex LastNumber();

    /// <summary>True when the table has a sweep column (a long table holding a whole family).</summary>
    public static bool HasSweepColumn(string path) => Header(path).Sweep >= 0;

    /// <summary>Reads one table: the sweeps of its sweep column, or one sweep numbered from the file name (else <paramref name="defaultSweep"/>).</summary>
    public static IReadOnlyList<RecordedSweep> Read(string path, int defaultSweep = 1)
    {
        string file = Path.GetFileName(path);
        try
        {
            return ReadTable(path, file, defaultSweep);
        }
        catch (ExpressionFormatException e)
        {
            throw new RecordingFormatException(e.Message);
        }
    }

    /// <summary>A cell from one long table (its file name is the cell id) or from one-sweep files (the directory's name is).</summary>
    public static RecordedCell ReadCell(string cellId, IReadOnlyList<string> files)
    {
        var sweeps = new List<RecordedSweep>();
        for (int k = 0; k < files.Count; k++) sweeps.AddRange(Read(files[k], k + 1));
        var dup = sweeps.GroupBy(s => s.SweepNumber).FirstOrDefault(g => g.Count() > 1);
        if (dup is not null) throw new RecordingFormatException($"{dup.First().Source}: sweep {dup.Key} appears twice (also {dup.Skip(1).First().Source}).");
        var ordered = sweeps.OrderBy(s => s.SweepNumber).ToArray();
        return new RecordedCell
        {
            CellId = cellId,
            Source = string.Join(", ", files.Select(Path.GetFileName)),
            Sweeps = ordered,
            Notes = [.. RecordedCell.GapNotes(ordered)]
        };
    }

    private sealed record Columns(int Time, double TimeToMs, int Voltage, double VoltageToMv, int Current, double CurrentToPa, int Sweep, int Count);

    private static Columns Header(string path)
    {
        string file = Path.GetFileName(path);
        try
        {
            var (delimiter, _) = DelimiterSniffer.Detect(path, file, MaxBytes);
            using var r = new RecordReader(InputFile.Open(path, MaxBytes), file, delimiter, 1 << 16, 64);
            if (!r.ReadRecord()) throw new RecordingFormatException($"{file}: line 1: the file is empty.");
            return Parse(r, file);
        }
        catch (ExpressionFormatException e)
        {
            throw new RecordingFormatException(e.Message);
        }
    }

    private static Columns Parse(RecordReader r, string file)
    {
        int time = -1, voltage = -1, current = -1, sweep = -1;
        double toMs = 0, toMv = 0, toPa = 0;
        for (int j = 0; j < r.FieldCount; j++)
        {
            var (name, unit) = ColumnHeader.Split(r.FieldString(j));
            string n = name.Trim().ToLowerInvariant();
            if (SweepNames.Contains(n)) { sweep = j; continue; }
            bool isTime = TimeNames.Contains(n), isV = VoltageNames.Contains(n), isI = CurrentNames.Contains(n);
            if (!isTime && !isV && !isI) continue;
            string kind = isTime ? "time" : isV ? "membrane potential" : "command current";
            string units = isTime ? SignalUnits.TimeUnits : isV ? SignalUnits.VoltageUnits : SignalUnits.CurrentUnits;
            if (unit is null) throw r.Error(j + 1, $"the {kind} column '{r.FieldString(j)}' states no unit: write it in the header, e.g. '{name} " +
                $"({(isTime ? "ms" : isV ? "mV" : "pA")})' ({units}).");
            double? f = isTime ? SignalUnits.ToMilliseconds(unit) : isV ? SignalUnits.ToMillivolts(unit) : SignalUnits.ToPicoamps(unit);
            if (f is null) throw r.Error(j + 1, $"unit '{unit}' of the {kind} column is not one of {units}.");
            if ((isTime ? time : isV ? voltage : current) >= 0) throw r.Error(j + 1, $"a second {kind} column.");
            if (isTime) { time = j; toMs = f.Value; }
            else if (isV) { voltage = j; toMv = f.Value; }
            else { current = j; toPa = f.Value; }
        }
        if (time < 0) throw new RecordingFormatException($"{file}: line 1: no time column (a header named 'time (ms)' or 'time (s)').");
        if (voltage < 0) throw new RecordingFormatException($"{file}: line 1: no membrane potential column (a header named 'V (mV)' or 'V (V)').");
        if (current < 0) throw new RecordingFormatException($"{file}: line 1: no command current column (a header named 'I (pA)' or 'I (nA)').");
        return new Columns(time, toMs, voltage, toMv, current, toPa, sweep, r.FieldCount);
    }

    private static List<RecordedSweep> ReadTable(string path, string file, int defaultSweep)
    {
        var (delimiter, _) = DelimiterSniffer.Detect(path, file, MaxBytes);
        using var r = new RecordReader(InputFile.Open(path, MaxBytes), file, delimiter, 1 << 16, 64);
        if (!r.ReadRecord()) throw new RecordingFormatException($"{file}: line 1: the file is empty.");
        var c = Parse(r, file);
        int fileSweep = LastNumber().Match(Path.GetFileNameWithoutExtension(path)) is { Success: true } m
            && int.TryParse(m.Value, out var k) ? k : defaultSweep;
        var sweeps = new List<RecordedSweep>();
        var done = new HashSet<int>();
        int current = int.MinValue;
        List<double> t = [], v = [], i = [];
        long firstLine = 0;
        void Finish()
        {
            if (t.Count == 0) return;
            sweeps.Add(MakeSweep(file, current == int.MinValue ? fileSweep : current, t, v, i, firstLine));
            t = []; v = []; i = [];
        }
        while (r.ReadRecord())
        {
            if (r.FieldCount != c.Count) throw r.Error(Math.Min(r.FieldCount, c.Count) + 1, $"{r.FieldCount} fields where the header has {c.Count}.");
            if (c.Sweep >= 0)
            {
                double s = Number(r, c.Sweep, "sweep number");
                if (s != Math.Floor(s) || s < 0 || s > int.MaxValue) throw r.Error(c.Sweep + 1, $"sweep number {s} is not a whole number >= 0.");
                if ((int)s != current)
                {
                    Finish();
                    current = (int)s;
                    if (!done.Add(current)) throw r.Error(c.Sweep + 1, $"sweep {current} starts again here: a sweep's rows must be together.");
                }
            }
            if (t.Count == 0) firstLine = r.LineNumber;
            t.Add(Number(r, c.Time, "time") * c.TimeToMs);
            v.Add(Number(r, c.Voltage, "membrane potential") * c.VoltageToMv);
            i.Add(Number(r, c.Current, "command current") * c.CurrentToPa);
            int n = t.Count;
            if (n >= 2 && !(t[n - 1] > t[n - 2]))
                throw r.Error(c.Time + 1, $"time does not increase ({t[n - 2] / c.TimeToMs:G6} then {t[n - 1] / c.TimeToMs:G6}); rows must be in time order " +
                    "within a sweep.");
            if (n >= 3 && Math.Abs(t[n - 1] - t[n - 2] - (t[1] - t[0])) > 0.01 * (t[1] - t[0]))
                throw r.Error(c.Time + 1, $"time step {(t[n - 1] - t[n - 2]):G4} ms differs from the sweep's first step {(t[1] - t[0]):G4} ms: sweeps must " +
                    "be sampled at a fixed rate.");
        }
        Finish();
        if (sweeps.Count == 0) throw new RecordingFormatException($"{file}: line 2: no data rows.");
        return sweeps;
    }

    private static RecordedSweep MakeSweep(string file, int number, List<double> t, List<double> v, List<double> i, long firstLine)
    {
        if (t.Count < 3) throw new RecordingFormatException($"{file}: line {firstLine}: sweep {number} has {t.Count} rows; a sweep needs many samples.");
        double dt = (t[^1] - t[0]) / (t.Count - 1);
        double rate = 1000 / dt;
        if (!(rate >= NwbReader.MinRateHz && rate <= NwbReader.MaxRateHz))
            throw new RecordingFormatException($"{file}: line {firstLine}: sweep {number} is sampled at {rate:G6} Hz, outside " +
                $"{NwbReader.MinRateHz / 1000:0}-{NwbReader.MaxRateHz / 1000:0} kHz; spike shapes need at least {NwbReader.MinRateHz / 1000:0} kHz.");
        return RecordedSweep.Create(number, dt, [.. v], [.. i], string.Create(CultureInfo.InvariantCulture, $"{file}, sweep {number} (from line {firstLine})"));
    }

    private static double Number(RecordReader r, int column, string what)
    {
        var f = r.Field(column).Trim();
        if (f.IsEmpty) throw r.Error(column + 1, $"empty {what}.");
        if (!double.TryParse(f, NumberStyles.Float, CultureInfo.InvariantCulture, out double x))
            throw r.Error(column + 1, $"'{ValueParser.Shorten(f)}' is not a number ({what}).");
        if (!double.IsFinite(x)) throw r.Error(column + 1, $"{what} is {new string(f)}; only finite numbers are read.");
        return x;
    }
}
