namespace ExprModel.Core.Recordings;

/// <summary>
/// Reads recorded sweep families from a path: an NWB file (.nwb), a text table (.csv, .tsv, .txt), or a directory of
/// either. In a directory every NWB file and every long table (one with a sweep column) is read on its own; one-sweep
/// tables together make one cell named after the directory.
/// </summary>
public static class RecordingReader
{
    private static readonly string[] TextExtensions = [".csv", ".tsv", ".txt"];

    public static IReadOnlyList<RecordedCell> Read(string path)
    {
        if (Directory.Exists(path)) return ReadDirectory(path);
        if (!File.Exists(path)) throw new RecordingFormatException($"{Path.GetFileName(path)}: file not found ({path}).");
        string ext = Path.GetExtension(path).ToLowerInvariant();
        if (TextExtensions.Contains(ext)) return [TraceCsvReader.ReadCell(Path.GetFileNameWithoutExtension(path), [path])];
        return NwbReader.Read(path);
    }

    private static List<RecordedCell> ReadDirectory(string dir)
    {
        var files = Directory.GetFiles(dir).Order(StringComparer.Ordinal).ToArray();
        var cells = new List<RecordedCell>();
        foreach (var f in files.Where(f => Path.GetExtension(f).Equals(".nwb", StringComparison.OrdinalIgnoreCase))) cells.AddRange(NwbReader.Read(f));
        var tables = files.Where(f => TextExtensions.Contains(Path.GetExtension(f).ToLowerInvariant())).ToArray();
        var single = new List<string>();
        foreach (var t in tables)
        {
            if (TraceCsvReader.HasSweepColumn(t)) cells.Add(TraceCsvReader.ReadCell(Path.GetFileNameWithoutExtension(t), [t]));
            else single.Add(t);
        }
        if (single.Count > 0) cells.Add(TraceCsvReader.ReadCell(new DirectoryInfo(dir).Name, single));
        if (cells.Count == 0) throw new RecordingFormatException($"{new DirectoryInfo(dir).Name}: no .nwb, .csv, .tsv or .txt files in the directory ({dir}).");
        var dup = cells.GroupBy(c => c.CellId).FirstOrDefault(g => g.Count() > 1);
        if (dup is not null) throw new RecordingFormatException($"{dup.First().Source}: cell '{dup.Key}' is also in {dup.Skip(1).First().Source}.");
        return cells;
    }
}
