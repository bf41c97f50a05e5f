using ExprModel.Core.Export;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Sensitivities of every read-out to every channel's density (rows: channels, columns: read-outs). Entries are null
/// where the read-out is undefined on either side of the difference.
/// </summary>
public sealed record SensitivityMatrix(
    IReadOnlyList<string> Channels,
    IReadOnlyList<SensitivityColumn> Columns,
    double?[][] Values,
    double StepLn,
    ReadoutValues Intact,
    IReadOnlyList<string> Notes)
{
    /// <summary>The entry for one channel and read-out, null when undefined or not in the matrix.</summary>
    public double? At(string channel, string readout)
    {
        int i = Channels.ToList().IndexOf(channel), j = Columns.ToList().FindIndex(c => c.Readout == readout);
        return i >= 0 && j >= 0 ? Values[i][j] : null;
    }

    /// <summary>Channels x read-outs as CSV; comment lines carry the caution, the step and which columns are not log ratios.</summary>
    public string ToCsv(IEnumerable<string> comments)
    {
        var head = comments.Concat(Notes).Concat(Columns.Where(c => c.Kind == ElasticityKind.PerLogDensity)
            .Select(c => $"{c.Readout}: {c.EntryUnit} (its sign can cross zero, so no log ratio)"))
            .Concat(Columns.Where(c => c.Resolution is not null).Select(c => FormattableString.Invariant($"{c.Readout}: {c.Quantisation}; entries below ") +
                FormattableString.Invariant($"{c.Resolution:0.###} in size are within one grid step")));
        var csv = new CsvTable(head, ["channel", .. Columns.Select(c => c.Readout)]);
        csv.Row(["unit", .. Columns.Select(c => (object?)c.EntryUnit)]);
        for (int i = 0; i < Channels.Count; i++) csv.Row([Channels[i], .. Values[i].Select(v => (object?)v)]);
        return csv.ToString();
    }
}
