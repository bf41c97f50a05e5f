using ExprModel.Core.Confrontation;
using ExprModel.Core.Expression;
using ExprModel.Core.Recordings;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// Reads uploaded recordings with the library's readers, which work on files: each upload goes to a private temporary
/// folder under its own (sanitised) name, so the readers' messages name the file the user sent and the dataset path or
/// line; library errors become <see cref="UserInputException"/> for the page.
/// </summary>
public static class RecordingUploads
{
    private static readonly string[] TraceExtensions = [".csv", ".tsv", ".txt"];

    /// <summary>
    /// Sweep families from NWB files and trace tables: each NWB file gives its cells, each table with a sweep column one
    /// cell named after the file; one-sweep tables sent together make one cell named after what their file names share
    /// ("FH1001_sweep_01.csv", "FH1001_sweep_02.csv" give FH1001).
    /// </summary>
    public static IReadOnlyList<RecordedCell> ReadSweeps(IReadOnlyList<UploadedFile> files)
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-recordings-");
        try
        {
            var cells = new List<RecordedCell>();
            var single = new List<string>();
            foreach (var f in files)
            {
                var path = Save(dir.FullName, f);
                bool table = TraceExtensions.Contains(Path.GetExtension(path).ToLowerInvariant());
                if (table && !TraceCsvReader.HasSweepColumn(path)) single.Add(path);
                else cells.AddRange(RecordingReader.Read(path));
            }
            if (single.Count > 0) cells.Add(TraceCsvReader.ReadCell(SharedStem(single.Select(Path.GetFileNameWithoutExtension).ToArray()!), single));
            var dup = cells.GroupBy(c => c.CellId, StringComparer.Ordinal).FirstOrDefault(g => g.Count() > 1);
            if (dup is not null) throw new UserInputException($"{dup.First().Source}: cell '{dup.Key}' is also in {dup.Skip(1).First().Source}.");
            return cells;
        }
        catch (RecordingFormatException e) { throw new UserInputException(e.Message); }
        catch (ExpressionFormatException e) { throw new UserInputException(e.Message); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
        finally
        {
            try { dir.Delete(recursive: true); } catch (IOException) { }
        }
    }

    /// <summary>A per-cell table of recorded values (the metadata table or a separate file), as read, before matching.</summary>
    public static RecordedFeatureTable ReadFeatureTable(UploadedFile file)
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-features-");
        try { return RecordedFeatureReader.Read(Save(dir.FullName, file), null, file.Name); }
        catch (ExpressionFormatException e) { throw new UserInputException(e.Message); }
        finally
        {
            try { dir.Delete(recursive: true); } catch (IOException) { }
        }
    }

    /// <summary>What the names share before their sweep numbers, without trailing separators or the word "sweep".</summary>
    public static string SharedStem(IReadOnlyList<string> names)
    {
        string stem = names[0];
        foreach (var n in names.Skip(1))
        {
            int k = 0;
            while (k < stem.Length && k < n.Length && stem[k] == n[k]) k++;
            stem = stem[..k];
        }
        if (names.Count == 1) stem = stem.TrimEnd("0123456789".ToCharArray());
        stem = stem.TrimEnd("0123456789_-. ".ToCharArray());
        if (stem.EndsWith("sweep", StringComparison.OrdinalIgnoreCase)) stem = stem[..^5].TrimEnd("_-. ".ToCharArray());
        return stem.Length > 0 ? stem : "recorded cell";
    }

    private static string Save(string dir, UploadedFile f)
    {
        var name = new string(Path.GetFileName(f.Name).Select(c => char.IsLetterOrDigit(c) || c is '.' or '-' or '_' ? c : '_').ToArray()).Trim('.');
        if (name.Length == 0) name = "recording";
        var path = Path.Combine(dir, name);
        for (int k = 2; File.Exists(path); k++) path = Path.Combine(dir, $"{Path.GetFileNameWithoutExtension(name)}-{k}{Path.GetExtension(name)}");
        File.WriteAllBytes(path, f.Bytes);
        return path;
    }
}
