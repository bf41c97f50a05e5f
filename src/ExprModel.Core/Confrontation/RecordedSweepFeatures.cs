using ExprModel.Core.Cell;
using ExprModel.Core.Recordings;

namespace ExprModel.Core.Confrontation;

/// <summary>
/// Read-outs measured from recorded sweeps (<see cref="RecordingFeatures"/>) as recorded features the confrontation
/// compares, and sweeps joined with a recorded-features table. Every value keeps its source (the recording file, or the
/// table and its column). Where both give a cell's read-out, the sweeps win (they are measured with the simulator's own
/// definitions) and the table's value is kept in a note.
/// </summary>
public static class RecordedSweepFeatures
{
    /// <summary>
    /// Read-outs of a sweep family that are not compared, with why: their recorded definition depends on the lab's
    /// step family in a way the model's does not.
    /// </summary>
    public static IReadOnlyDictionary<string, string> NotComparable { get; } = new Dictionary<string, string>(StringComparer.Ordinal)
    {
        ["first_spike_latency"] = "measured on the family's smallest spiking step, which lies up to one step spacing above the true rheobase; latency falls "
            + "steeply just above rheobase, so it is not compared with the model's latency at its exact rheobase.",
    };

    /// <summary>The measured cells' read-outs under the simulator's names and units (current densities are left out: a recording has no area).</summary>
    /// <param name="source">What the recordings are called in messages (a file or directory name).</param>
    /// <param name="isExpressionCell">True for a cell id of the expression table; a recorded cell that is not is an error.</param>
    /// <exception cref="RecordingFormatException">A recorded cell is not in the expression table (its file is named).</exception>
    public static RecordedFeatures From(IReadOnlyList<RecordedReadouts> measured, string source, Func<string, bool> isExpressionCell)
    {
        foreach (var m in measured)
            if (!isExpressionCell(m.CellId))
                throw new RecordingFormatException($"{m.Source}: recorded cell '{m.CellId}' is not in the expression table (its cell ids must match the " +
                    "recordings' cell ids).");
        var matches = new List<ReadoutMatch>();
        var readouts = new List<RecordedReadout>();
        int column = 0;
        foreach (var (name, unit) in ReadoutMatcher.Readouts.Where(r =>
                     MeasurementUnits.Parse(r.Unit)!.Quantity is not (Quantity.CurrentDensity or Quantity.RatePerCurrentDensity)))
        {
            column++;
            string header = $"{name} ({unit}), from the sweeps";
            if (NotComparable.TryGetValue(name, out var why))
            {
                matches.Add(new ReadoutMatch(column, header, null, unit, null, false, why));
                continue;
            }
            var values = new Dictionary<string, double>(StringComparer.Ordinal);
            var sources = new Dictionary<string, string>(StringComparer.Ordinal);
            foreach (var m in measured)
                if (m.Readouts.Rows().First(x => x.Name == name).Value is { } v && double.IsFinite(v))
                {
                    values[m.CellId] = v;
                    sources[m.CellId] = "sweeps " + m.Source;
                }
            if (values.Count == 0)
            {
                matches.Add(new ReadoutMatch(column, header, null, unit, null, false, "no recorded cell gives a value."));
                continue;
            }
            var u = MeasurementUnits.Parse(unit)!;
            matches.Add(new ReadoutMatch(column, header, name, unit, unit, false,
                $"measured from the sweeps with the simulator's definition -> {name} ({unit})."));
            readouts.Add(new RecordedReadout(name, header, u, u, values) { SourceByCell = sources });
        }
        var cells = measured.Where(m => readouts.Any(r => r.ValueByCell.ContainsKey(m.CellId))).Select(m => m.CellId).ToArray();
        var notes = measured.SelectMany(m => m.Readouts.Notes.Select(n => $"{m.CellId}: {n}")).ToArray();
        return new RecordedFeatures { Source = source, Matches = matches, Readouts = readouts, RecordedCells = cells, Notes = notes };
    }

    /// <summary>
    /// Sweeps beside a table: every read-out of either; a cell's value from the sweeps when they give one (the table's
    /// value, converted to the read-out's unit, is then named in a note), else from the table.
    /// </summary>
    public static RecordedFeatures Join(RecordedFeatures sweeps, RecordedFeatures table)
    {
        var readouts = new List<RecordedReadout>();
        var notes = new List<string>(table.Notes);
        notes.AddRange(sweeps.Notes);
        var fromTable = table.Readouts.ToDictionary(r => r.Readout, StringComparer.Ordinal);
        foreach (var s in sweeps.Readouts)
        {
            if (!fromTable.Remove(s.Readout, out var t))
            {
                readouts.Add(s);
                continue;
            }
            if (!MeasurementUnits.CanConvert(t.ColumnUnit, s.ReadoutUnit, withArea: false))
            {
                notes.Add($"{table.Source}: column '{t.Header}' ({t.ColumnUnit.Symbol}) needs the cell's area to become {s.Readout} " +
                    $"({s.ReadoutUnit.Symbol}); the sweeps' values alone are compared.");
                readouts.Add(s);
                continue;
            }
            var values = new Dictionary<string, double>(s.ValueByCell, StringComparer.Ordinal);
            var sources = new Dictionary<string, string>(s.SourceByCell ?? new Dictionary<string, string>(), StringComparer.Ordinal);
            var cellNotes = new Dictionary<string, string>(StringComparer.Ordinal);
            foreach (var (cell, raw) in t.ValueByCell)
            {
                double v = MeasurementUnits.Convert(raw, t.ColumnUnit, s.ReadoutUnit, null);
                if (values.TryGetValue(cell, out var swept))
                    cellNotes[cell] = FormattableString.Invariant($"the table {table.Source} ('{t.Header}') gives {v:G4} {s.ReadoutUnit.Symbol}; the ") +
                        FormattableString.Invariant($"sweeps' {swept:G4} is used.");
                else
                {
                    values[cell] = v;
                    sources[cell] = TableSource(table, t);
                }
            }
            readouts.Add(s with { Header = $"{s.Header}; else '{t.Header}'", ValueByCell = values, SourceByCell = sources, NoteByCell = cellNotes });
        }
        foreach (var t in table.Readouts.Where(r => fromTable.ContainsKey(r.Readout)))
            readouts.Add(t with { SourceByCell = t.ValueByCell.Keys.ToDictionary(c => c, _ => TableSource(table, t), StringComparer.Ordinal) });
        var order = ReadoutMatcher.Readouts.Select(r => r.Name).ToList();
        readouts.Sort((a, b) => order.IndexOf(a.Readout).CompareTo(order.IndexOf(b.Readout)));
        var cells = sweeps.RecordedCells.Concat(table.RecordedCells.Where(c => !sweeps.RecordedCells.Contains(c))).ToArray();
        return new RecordedFeatures
        {
            Source = $"{sweeps.Source} (sweeps) and {table.Source} (table)",
            Matches = [.. sweeps.Matches, .. table.Matches],
            Readouts = readouts,
            RecordedCells = cells,
            Notes = notes,
        };
    }

    private static string TableSource(RecordedFeatures table, RecordedReadout r) => $"table {table.Source}, column '{r.Header}'";
}
