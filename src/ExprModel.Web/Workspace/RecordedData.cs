using ExprModel.Core.Confrontation;
using ExprModel.Core.Export;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Recordings;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// What this tab knows was recorded: the per-cell recorded-features table (the metadata table by default, or an uploaded
/// one) with its columns matched to read-outs by the library's <see cref="ReadoutMatcher"/> (the match shown and
/// editable), and recorded sweep families per cell id with their read-outs measured by <see cref="RecordingFeatures"/>
/// (the simulator's definitions). <see cref="ValuesFor"/> gives the recorded values of a model's target.
/// </summary>
public sealed class RecordedData
{
    private readonly Dictionary<string, RecordedCell> _cells = new(StringComparer.Ordinal);
    private readonly Dictionary<string, RecordedReadouts> _sweepReadouts = new(StringComparer.Ordinal);
    private readonly Dictionary<string, string> _choices = new(StringComparer.Ordinal);
    private Func<string, bool> _isCell = _ => true;
    private Func<string, string?> _groupOf = _ => null;

    /// <summary>The recorded-features table as read (before matching); null when none is loaded.</summary>
    public RecordedFeatureTable? Table { get; private set; }
    /// <summary>True when <see cref="Table"/> is the metadata table (the default source of recorded values).</summary>
    public bool TableIsMetadata { get; private set; }
    /// <summary>The table matched to read-outs; null without a table.</summary>
    public RecordedFeatures? Features { get; private set; }
    /// <summary>
    /// What the predictions are compared with: the recorded sweeps' read-outs joined with the table by the library
    /// (<see cref="RecordedSweepFeatures.Join"/>: a cell's sweeps win, the table's value is then named in a note), as
    /// `exprmodel compare --recordings` does; the table alone without sweeps; null with neither.
    /// </summary>
    public RecordedFeatures? Compared
    {
        get
        {
            if (_sweepReadouts.Count == 0) return Features;
            var sweeps = RecordedSweepFeatures.From(_sweepReadouts.Values.ToArray(), "recorded sweeps", _isCell);
            return Features is null ? sweeps : RecordedSweepFeatures.Join(sweeps, Features);
        }
    }
    /// <summary>The user's column choices: header to read-out name, or to "none".</summary>
    public IReadOnlyDictionary<string, string> ColumnChoices => _choices;
    /// <summary>True once <see cref="Match"/> checked the cell ids against the expression table.</summary>
    public bool MatchedToDataset { get; private set; }

    /// <summary>Recorded sweep families by cell id, and their read-outs.</summary>
    public IReadOnlyDictionary<string, RecordedCell> Cells => _cells;
    public IReadOnlyDictionary<string, RecordedReadouts> SweepReadouts => _sweepReadouts;

    /// <summary>True when some cell has a matched recorded value or recorded sweeps.</summary>
    public bool HasValues => Features is { Readouts.Count: > 0, RecordedCells.Count: > 0 } || _sweepReadouts.Count > 0;

    /// <summary>Increases on every change, so a view can tell its result is stale.</summary>
    public int Version { get; private set; }

    /// <summary>Uses <paramref name="table"/> as the recorded-features table; the column choices start afresh.</summary>
    public void UseTable(RecordedFeatureTable table, bool isMetadata)
    {
        Table = table;
        TableIsMetadata = isMetadata;
        _choices.Clear();
        Rematch();
    }

    public void ClearTable()
    {
        Table = null;
        TableIsMetadata = false;
        Features = null;
        _choices.Clear();
        Version++;
    }

    /// <summary>Measures each family's read-outs and keeps them (a cell id already held is replaced).</summary>
    public void AddSweeps(IEnumerable<RecordedCell> cells)
    {
        foreach (var c in cells)
        {
            _cells[c.CellId] = c;
            _sweepReadouts[c.CellId] = RecordingFeatures.Measure(c);
        }
        Version++;
    }

    public void ClearSweeps()
    {
        _cells.Clear();
        _sweepReadouts.Clear();
        Version++;
    }

    /// <summary>Matches column <paramref name="header"/> to <paramref name="readout"/> (a read-out name, "none", or "" for the automatic match).</summary>
    /// <exception cref="UserInputException">The column's unit does not measure that read-out (the library's message).</exception>
    public void Choose(string header, string readout)
    {
        var before = _choices.GetValueOrDefault(header);
        if (readout.Length == 0) _choices.Remove(header);
        else _choices[header] = readout;
        try { Rematch(); }
        catch (UserInputException)
        {
            if (before is null) _choices.Remove(header); else _choices[header] = before;
            Rematch();
            throw;
        }
    }

    /// <summary>
    /// Ties the recorded data to the expression table just read: every recorded cell must be one of its cells (an error
    /// names the file and line, or the recording), and groups come from its group column.
    /// </summary>
    /// <exception cref="UserInputException">A recorded cell is not in the expression table.</exception>
    public void Match(ExpressionDataset data)
    {
        var ids = data.Table.CellIds.ToHashSet(StringComparer.Ordinal);
        var groups = new Dictionary<string, string>(StringComparer.Ordinal);
        if (data.Groups is { } g)
            foreach (var (group, members) in g.Members)
                foreach (int i in members) groups[data.Table.CellIds[i]] = group;
        foreach (var c in _cells.Values)
            if (!ids.Contains(c.CellId))
                throw new UserInputException($"{c.Source}: recorded cell '{c.CellId}' is not a cell of {data.Table.Source}; remove the recording or load "
                    + "the table it belongs to.");
        _isCell = ids.Contains;
        _groupOf = groups.GetValueOrDefault;
        MatchedToDataset = true;
        Rematch();
    }

    /// <summary>The group of a recorded cell in the matched dataset, or null.</summary>
    public string? GroupOf(string cellId) => _groupOf(cellId);

    /// <summary>
    /// The recorded values of a model's target, by read-out name (as <c>CellReadouts.Rows()</c> names it), in the
    /// read-out's unit. For a cell: its value from its recorded sweeps, else from the recorded-features table. For a
    /// group: the mean over its recorded cells (each cell's value as for a cell), their sample SD (null below 3
    /// cells) and their number. Read-outs no cell has are absent; an empty answer means nothing was recorded.
    /// Needs <see cref="Match"/> for groups (it knows the group column).
    /// </summary>
    public IReadOnlyDictionary<string, RecordedValue> ValuesFor(ModelTarget target)
    {
        if (target.CellId is { } cell) return CellValues(cell);
        var members = RecordedCellIds().Where(c => _groupOf(c) == target.Group).Select(CellValues).ToArray();
        var result = new Dictionary<string, RecordedValue>(StringComparer.Ordinal);
        foreach (var name in members.SelectMany(m => m.Keys).Distinct(StringComparer.Ordinal))
        {
            var values = members.Where(m => m.ContainsKey(name)).Select(m => m[name]).ToArray();
            // The library's group statistics: mean over the defined values, and the SD the z-scores use.
            var spread = ReadoutSpread.Over(values.Select(v => (double?)v.Value))!;
            double? sd = AgreementStatistics.SpreadOf(values.Select(v => v.Value).ToArray());
            string source = string.Join(", ", values.Select(v => v.Source).Distinct(StringComparer.Ordinal));
            result[name] = new RecordedValue(name, values[0].Unit, spread.Mean, sd, values.Length, source);
        }
        return result;
    }

    /// <summary>
    /// Fit targets for a model's target from what it was compared with (<see cref="Compared"/>), by the library's
    /// <see cref="RecordedFitTargets.For"/> (a cell: its values with each read-out's default scale; a group: the mean
    /// scaled by the group's recorded SD); null when the target has no recorded values. The same answer comes back as
    /// the same object until the recorded data change, so a panel can tell a new pre-fill from a repeated one.
    /// </summary>
    /// <param name="areaUm2">The model's membrane area, to convert a current recorded per area (or the reverse).</param>
    public RecordedTargets? FitTargetsFor(ModelTarget? target, double areaUm2)
    {
        if (target is null || Compared is not { } compared) return null;
        // Keyed without the area: a change of the area control must not replace targets the user has edited since.
        var key = (target, Version);
        if (_targetsKey == key) return _targets is { Targets.Count: > 0 } ? _targets : null;
        _targetsKey = key;
        _targets = null;
        try
        {
            var members = target.Group is { } g ? RecordedCellIds().Where(c => _groupOf(c) == g).ToArray() : null;
            if (target.CellId is { } c ? compared.RecordedCells.Contains(c) : members is { Length: > 0 })
                _targets = RecordedFitTargets.For(compared, _sweepReadouts.Values.ToArray(), target.CellId, target.Group, members, areaUm2);
        }
        catch (ArgumentException) { _targets = null; }
        return _targets is { Targets.Count: > 0 } ? _targets : null;
    }

    private (ModelTarget, int)? _targetsKey;
    private RecordedTargets? _targets;

    /// <summary>Every cell with a recorded value or sweeps, table cells first.</summary>
    public IEnumerable<string> RecordedCellIds() =>
        (Features?.RecordedCells ?? []).Concat(_sweepReadouts.Keys.Order(StringComparer.Ordinal)).Distinct(StringComparer.Ordinal);

    private Dictionary<string, RecordedValue> CellValues(string cell)
    {
        // A cell's sweeps win over the table, as in the comparison (RecordedSweepFeatures.Join) and `exprmodel compare`.
        var result = new Dictionary<string, RecordedValue>(StringComparer.Ordinal);
        if (_sweepReadouts.TryGetValue(cell, out var swept))
        {
            foreach (var (name, unit, value) in swept.Readouts.Rows())
            {
                if (value is { } v && double.IsFinite(v)) result[name] = new RecordedValue(name, unit, v, null, 1, "sweeps");
            }
        }
        foreach (var r in Features?.Readouts ?? [])
        {
            if (!r.ValueByCell.TryGetValue(cell, out var raw) || result.ContainsKey(r.Readout)) continue;
            // A column in pA for a read-out in uA/cm2 needs a model's area; such values join the comparison on the Map page only.
            if (r.ColumnUnit.Quantity != r.ReadoutUnit.Quantity) continue;
            result[r.Readout] = new RecordedValue(r.Readout, r.ReadoutUnit.Symbol, r.InReadoutUnit(raw, null), null, 1, $"'{r.Header}'");
        }
        return result;
    }

    private void Rematch()
    {
        Version++;
        Features = null;
        if (Table is null) return;
        try { Features = ReadoutMatcher.Match(Table, _isCell, _choices); }
        catch (ExpressionFormatException e) { throw new UserInputException(e.Message); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
    }
}
