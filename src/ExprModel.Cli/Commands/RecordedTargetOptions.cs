using System.CommandLine;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Recordings;

namespace ExprModel.Cli.Commands;

/// <summary>
/// The fit command's targets from recordings: a recorded-features table (--recorded) or sweeps (--recordings), for one
/// cell (--cell) or a group's mean (--group, members from --metadata or the recorded table's --group-by column).
/// </summary>
public sealed class RecordedTargetOptions
{
    private readonly Option<string?> _recorded = new("--recorded")
    {
        Description = "Per-cell table of recorded values with units in the headers (as for " +
        "compare)."
    };
    private readonly Option<string?> _recordings = new("--recordings")
    {
        Description = "Recorded sweeps (NWB file, trace table or directory): read-outs " +
        "measured per cell."
    };
    private readonly Option<string?> _cell = new("--cell") { Description = "Fit to this recorded cell's values." };
    private readonly Option<string?> _group = new("--group")
    {
        Description = "Fit to this group's recorded mean, scaled by its recorded SD (default scales " +
        "below 3 cells)."
    };
    private readonly Option<string?> _metadata = new("--metadata") { Description = "Cell metadata with the group column (default: the --recorded table)." };
    private readonly Option<string> _groupBy = new("--group-by") { Description = "Group column of the metadata.", DefaultValueFactory = _ => "group" };
    private readonly Option<string[]> _readouts = new("--fit-readouts")
    {
        Description = "Recorded read-outs to fit (default: those whose recorded definition is the model's: rest, input resistance, time constant, sag, " +
            "rheobase, spike shape, f-I gain).",
        AllowMultipleArgumentsPerToken = true,
    };

    public void AddTo(Command c)
    {
        foreach (var o in new Option[] { _recorded, _recordings, _cell, _group, _metadata, _groupBy, _readouts }) c.Options.Add(o);
    }

    public bool Given(ParseResult p) => p.GetValue(_recorded) is not null || p.GetValue(_recordings) is not null;

    /// <param name="areaUm2">The model's membrane area (converts values recorded per area or in absolute current).</param>
    public RecordedTargets Targets(ParseResult p, double areaUm2)
    {
        var (cell, group) = (p.GetValue(_cell), p.GetValue(_group));
        if ((cell is null) == (group is null)) throw new CliException("With --recorded or --recordings give --cell ID or --group G (one of the two).");
        var (tablePath, sweepsPath) = (p.GetValue(_recorded), p.GetValue(_recordings));
        if (tablePath is not null && sweepsPath is not null) throw new CliException("--recorded and --recordings exclude each other here; compare joins " +
            "them, a fit takes one source.");
        var readouts = p.GetValue(_readouts) is { Length: > 0 } r
            ? r.SelectMany(x => x.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)).ToArray() : null;
        RecordedFeatures features;
        IReadOnlyList<RecordedReadouts> measured = [];
        try
        {
            if (sweepsPath is not null)
            {
                measured = RecordingReader.Read(sweepsPath).Select(c => RecordingFeatures.Measure(c)).ToArray();
                features = RecordedSweepFeatures.From(measured, Path.GetFileName(Path.TrimEndingDirectorySeparator(sweepsPath)), _ => true);
            }
            else features = ReadoutMatcher.Match(RecordedFeatureReader.Read(tablePath!), _ => true);
        }
        catch (RecordingFormatException e) { throw new CliException(e.Message); }
        try
        {
            IReadOnlyList<string>? members = null;
            if (group is not null)
            {
                string metadataPath = p.GetValue(_metadata) ?? tablePath
                    ?? throw new CliException("--group needs --metadata FILE with the group column (the recordings carry no groups).");
                var metadata = CellMetadataReader.Read(metadataPath, new CellMetadataOptions { GroupColumns = [p.GetValue(_groupBy)!] });
                members = metadata.CellsIn(p.GetValue(_groupBy)!, group);
                if (members.Count == 0) throw new CliException($"{Path.GetFileName(metadataPath)}: no cell in group '{group}' (groups: " +
                    $"{string.Join(", ", metadata.Groups(p.GetValue(_groupBy)!))}).");
            }
            return RecordedFitTargets.For(features, measured, cell, group, members, areaUm2, readouts);
        }
        catch (ArgumentException e) { throw new CliException(e.Message); }
        catch (KeyNotFoundException e) { throw new CliException(e.Message); }
    }
}
