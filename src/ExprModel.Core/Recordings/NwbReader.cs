using PureHDF;
using static ExprModel.Core.Recordings.NwbSchema;

namespace ExprModel.Core.Recordings;

/// <summary>
/// Reads current-clamp sweep families from NWB 2.x files (names in <see cref="NwbSchema"/>): every CurrentClampSeries
/// under /acquisition is paired with the CurrentClampStimulusSeries under /stimulus/presentation that has the same
/// sweep_number and electrode; series are grouped into cells by their electrode (named by its cell_id when present,
/// else by the file). Other core series types are skipped with a note; an unknown type is refused. Values are turned
/// into mV and pA through <see cref="SignalUnits"/> from the "unit", "conversion" and "offset" attributes.
/// </summary>
public static class NwbReader
{
    /// <summary>Sampling rates read (Hz): current-clamp read-outs need spike upstrokes resolved (common practice: 10 kHz or more).</summary>
    public const double MinRateHz = 10_000, MaxRateHz = 100_000;

    private sealed record Series(string Path, int SweepNumber, double SampleIntervalMs, double[] Values, string CellKey);

    public static IReadOnlyList<RecordedCell> Read(string path)
    {
        string file = Path.GetFileName(path);
        var at = new NwbAccess(file);
        using var h5 = NwbAccess.Open(path);
        var type = at.StringAttribute(h5, NeurodataType, "/");
        if (type != NwbFile)
            throw at.Error("/", $"root attribute {NeurodataType} is {(type is null ? "missing" : $"'{type}'")}, not '{NwbFile}': an HDF5 file, but not an " +
                "NWB file.");
        var version = at.StringAttribute(h5, NwbVersion, "/");
        if (version is null || !version.StartsWith("2.", StringComparison.Ordinal))
            throw at.Error("/", $"{NwbVersion} is {(version is null ? "missing" : $"'{version}'")}: only NWB 2.x files are read.");
        var notes = new List<string>();
        if (at.Child(h5, Acquisition, "/" + Acquisition) is not IH5Group acquisition)
            throw at.Error("/" + Acquisition, "missing: the file holds no acquired data.");
        var responses = ReadGroup(at, acquisition, "/" + Acquisition, CurrentClampSeries, "volts", notes);
        if (responses.Count == 0) throw at.Error("/" + Acquisition, $"holds no {CurrentClampSeries}: no current-clamp sweeps to read.");

        string presentationPath = $"/{Stimulus}/{Presentation}";
        var stimuli = new Dictionary<(string, int), Series>();
        if (at.Child(h5, Stimulus, "/" + Stimulus) is IH5Group stimulus && at.Child(stimulus, Presentation, presentationPath) is IH5Group presentation)
            foreach (var s in ReadGroup(at, presentation, presentationPath, CurrentClampStimulusSeries, "amperes", notes))
                if (!stimuli.TryAdd((s.CellKey, s.SweepNumber), s))
                    throw at.Error(s.Path, $"a second stimulus with {SweepNumber} {s.SweepNumber} for the same electrode (the first is " +
                        $"{stimuli[(s.CellKey, s.SweepNumber)].Path}).");

        var cells = new List<RecordedCell>();
        foreach (var cell in responses.GroupBy(r => r.CellKey))
        {
            var sweeps = new List<RecordedSweep>();
            var seen = new Dictionary<int, string>();
            foreach (var r in cell.OrderBy(r => r.SweepNumber))
            {
                if (!seen.TryAdd(r.SweepNumber, r.Path))
                    throw at.Error(r.Path, $"{SweepNumber} {r.SweepNumber} is also used by {seen[r.SweepNumber]} for the same electrode.");
                if (!stimuli.TryGetValue((r.CellKey, r.SweepNumber), out var s))
                    throw at.Error(r.Path, $"sweep {r.SweepNumber} has no stimulus: no {CurrentClampStimulusSeries} with {SweepNumber} {r.SweepNumber} and " +
                        $"the same electrode under {presentationPath}.");
                if (Math.Abs(s.SampleIntervalMs - r.SampleIntervalMs) > 1e-9 * r.SampleIntervalMs)
                    throw at.Error(r.Path, $"sampled at {1000 / r.SampleIntervalMs:0.###} Hz but its stimulus {s.Path} at {1000 / s.SampleIntervalMs:0.###} " +
                        "Hz.");
                if (r.Values.Length > s.Values.Length)
                    throw at.Error(r.Path + "/" + Data, $"mismatched lengths: {r.Values.Length:N0} voltage samples but only {s.Values.Length:N0} stimulus " +
                        $"samples in {s.Path}/{Data}.");
                sweeps.Add(RecordedSweep.Create(r.SweepNumber, r.SampleIntervalMs, r.Values, s.Values, $"{file}: {r.Path}"));
            }
            string id = cell.Key.StartsWith("cell:", StringComparison.Ordinal) ? cell.Key[5..] : Path.GetFileNameWithoutExtension(file)
                + (responses.Select(x => x.CellKey).Distinct().Count() > 1 ? "/" + cell.Key : "");
            cells.Add(new RecordedCell { CellId = id, Source = file, Sweeps = sweeps, Notes = [.. notes, .. RecordedCell.GapNotes(sweeps)] });
        }
        return cells;
    }

    private static List<Series> ReadGroup(NwbAccess at, IH5Group group, string groupPath, string wanted, string baseUnit, List<string> notes)
    {
        var found = new List<Series>();
        foreach (var child in at.Guard(groupPath, () => group.Children().ToList()))
        {
            string path = $"{groupPath}/{child.Name}";
            if (child is not IH5Group series)
            {
                notes.Add($"{path}: a dataset outside any series, skipped.");
                continue;
            }
            var type = at.StringAttribute(series, NeurodataType, path);
            if (type == wanted) found.Add(ReadSeries(at, series, path, baseUnit));
            else if (type is not null && (OtherCoreSeries.Contains(type) || type is CurrentClampSeries or CurrentClampStimulusSeries))
                notes.Add($"{path}: {type} skipped (not a {wanted}).");
            else
                throw at.Error(path, $"unknown series type {(type is null ? "(no neurodata_type attribute)" : $"'{type}'")}: current-clamp sweeps are " +
                    $"{CurrentClampSeries} under /{Acquisition} with their {CurrentClampStimulusSeries} under /{Stimulus}/{Presentation}.");
        }
        return found;
    }

    private static Series ReadSeries(NwbAccess at, IH5Group g, string path, string baseUnit)
    {
        var number = at.NumberAttribute(g, SweepNumber, path)
            ?? throw at.Error(path, $"no {SweepNumber} attribute: the series cannot be paired with its stimulus.");
        if (number < 0 || number > int.MaxValue || number != Math.Floor(number)) throw at.Error(path, $"{SweepNumber} {number} is not a whole number >= 0.");
        string dataPath = $"{path}/{Data}";
        if (at.Child(g, Data, dataPath) is not IH5Dataset data) throw at.Error(dataPath, "missing.");
        var unit = at.StringAttribute(data, Unit, dataPath) ?? throw at.Error(dataPath, $"attribute '{Unit}' missing: the values' unit is unknown.");
        bool voltage = baseUnit == "volts";
        double factor = (voltage ? SignalUnits.ToMillivolts(unit) : SignalUnits.ToPicoamps(unit))
            ?? throw at.Error(dataPath, $"attribute '{Unit}' is '{unit}', not a {(voltage ? "voltage" : "current")} unit " +
                $"({(voltage ? SignalUnits.VoltageUnits : SignalUnits.CurrentUnits)}); the schema fixes it to '{baseUnit}'.");
        double conversion = at.NumberAttribute(data, Conversion, dataPath) ?? 1;
        double offset = at.NumberAttribute(data, Offset, dataPath) ?? 0;
        if (!double.IsFinite(conversion) || conversion == 0) throw at.Error(dataPath,
            $"attribute '{Conversion}' is {conversion}; it must be a finite, non-zero factor.");
        if (!double.IsFinite(offset)) throw at.Error(dataPath, $"attribute '{Offset}' is {offset}; it must be finite.");
        double dt = SampleIntervalMs(at, g, path);
        var values = at.Samples(data, dataPath);
        // One factor from stored values to mV or pA (0.001 x 1000 is exactly 1 in doubles, so mV stored as mV stay exact).
        double scale = conversion * factor, shift = offset * factor;
        for (int i = 0; i < values.Length; i++) values[i] = values[i] * scale + shift;
        return new Series(path, (int)number, dt, values, CellKey(at, g, path));
    }

    private static double SampleIntervalMs(NwbAccess at, IH5Group g, string path)
    {
        double rate;
        if (at.Child(g, StartingTime, $"{path}/{StartingTime}") is IH5Dataset start)
            rate = at.NumberAttribute(start, Rate, $"{path}/{StartingTime}")
                ?? throw at.Error($"{path}/{StartingTime}", $"attribute '{Rate}' missing: the sampling rate is unknown.");
        else if (at.Child(g, Timestamps, $"{path}/{Timestamps}") is IH5Dataset stamps)
        {
            string tp = $"{path}/{Timestamps}";
            var t = at.Samples(stamps, tp);
            if (t.Length < 2) throw at.Error(tp, "fewer than two timestamps: the sampling rate is unknown.");
            double step = (t[^1] - t[0]) / (t.Length - 1);
            for (int i = 1; i < t.Length; i++)
                if (Math.Abs(t[i] - t[i - 1] - step) > 0.01 * step)
                    throw at.Error(tp, $"element {i}: timestamps are not evenly spaced ({t[i] - t[i - 1]:G4} s after the previous, {step:G4} s on average); " +
                        "sweeps must be sampled at a fixed rate.");
            rate = 1 / step;
        }
        else throw at.Error(path, $"neither {StartingTime} (with its {Rate}) nor {Timestamps}: the sampling rate is unknown.");
        if (!(rate >= MinRateHz && rate <= MaxRateHz))
            throw at.Error($"{path}/{StartingTime}", $"sampling rate {rate:G6} Hz is outside {MinRateHz / 1000:0}-{MaxRateHz / 1000:0} kHz; spike shapes " +
                $"need at least {MinRateHz / 1000:0} kHz.");
        return 1000 / rate;
    }

    /// <summary>The cell a series belongs to: its electrode's cell_id, else the electrode's path, else the file's one cell.</summary>
    private static string CellKey(NwbAccess at, IH5Group g, string path)
    {
        string ep = $"{path}/{Electrode}";
        if (at.Child(g, Electrode, ep) is not IH5Group electrode) return "electrode:?";
        if (at.Child(electrode, CellId, ep + "/" + CellId) is IH5Dataset id && at.Guard(ep, () => id.Read<string>()) is { Length: > 0 } cell)
            return "cell:" + cell;
        return "electrode:" + electrode.Name;
    }
}
