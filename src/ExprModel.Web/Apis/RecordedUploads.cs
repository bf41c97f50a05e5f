using System.Text.RegularExpressions;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Recordings;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

/// <summary>
/// Recorded values sent to the API: a recorded-features table and recorded sweeps (NWB files or trace tables), read by
/// the library's readers from a private temporary directory (they work on files) that is removed afterwards. Errors
/// name the upload and become 400s.
/// </summary>
public static partial class RecordedUploads
{
    [GeneratedRegex(@"^[A-Za-z0-9][A-Za-z0-9._-]{0,127}\.(nwb|csv|tsv|txt)$", RegexOptions.IgnoreCase)]
    private static partial Regex SafeName();

    /// <summary>Reads and matches a recorded table; <paramref name="isCell"/> says which cell ids the expression table has.</summary>
    public static RecordedFeatures Table(byte[] bytes, string name, string? cellColumn, IReadOnlyDictionary<string, string>? map, Func<string, bool> isCell) =>
        InTemporaryDirectory(dir =>
        {
            var path = Path.Combine(dir, "recorded.csv");
            File.WriteAllBytes(path, bytes);
            var features = ReadoutMatcher.Match(RecordedFeatureReader.Read(path, cellColumn, Path.GetFileName(name)), isCell, map);
            if (features.Readouts.Count == 0)
                throw new UserInputException($"{features.Source}: no column matched a read-out "
                    + $"({string.Join("; ", features.Matches.Select(m => $"'{m.Header}': {m.Reason}"))}).");
            return features;
        });

    /// <summary>Reads each uploaded recording on its own (file name = cell for a trace table) and measures it.</summary>
    /// <param name="files">File name (.nwb, .csv, .tsv or .txt) and bytes of each upload.</param>
    public static IReadOnlyList<RecordedReadouts> Measure(IReadOnlyList<(string FileName, byte[] Bytes)> files) =>
        InTemporaryDirectory(dir =>
        {
            var cells = new List<RecordedCell>();
            foreach (var (fileName, bytes) in files)
            {
                var name = Path.GetFileName(fileName);
                if (!SafeName().IsMatch(name))
                    throw new UserInputException($"recording '{fileName}': the file name must be letters, digits, '.', '_' or '-' ending in .nwb, .csv, "
                        + ".tsv or .txt.");
                var path = Path.Combine(dir, name);
                if (File.Exists(path)) throw new UserInputException($"recording '{name}': sent twice.");
                File.WriteAllBytes(path, bytes);
                cells.AddRange(RecordingReader.Read(path));
            }
            if (cells.GroupBy(c => c.CellId).FirstOrDefault(g => g.Count() > 1) is { } dup)
                throw new UserInputException($"{dup.First().Source}: cell '{dup.Key}' is also in {dup.Skip(1).First().Source}.");
            return cells.Select(c => RecordingFeatures.Measure(c)).ToArray();
        });

    /// <summary>The cells of <paramref name="group"/> in a metadata table's <paramref name="groupBy"/> column.</summary>
    public static IReadOnlyList<string> GroupMembers(byte[] bytes, string groupBy, string group) =>
        InTemporaryDirectory(dir =>
        {
            var path = Path.Combine(dir, "metadata.csv");
            File.WriteAllBytes(path, bytes);
            var metadata = CellMetadataReader.Read(path, new CellMetadataOptions { GroupColumns = [groupBy] });
            if (!metadata.Labels.ContainsKey(groupBy))
                throw new UserInputException($"groupBy: the metadata has no column '{groupBy}' (label columns: {string.Join(", ", metadata.Labels.Keys)}).");
            var members = metadata.CellsIn(groupBy, group);
            if (members.Count == 0) throw new UserInputException($"group: no cell in group '{group}' (groups: {string.Join(", ", metadata.Groups(groupBy))}).");
            return members;
        });

    private static T InTemporaryDirectory<T>(Func<string, T> work)
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-recorded-");
        try { return work(dir.FullName); }
        catch (ExpressionFormatException e) { throw new UserInputException(e.Message); }
        catch (RecordingFormatException e) { throw new UserInputException(e.Message); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
        finally
        {
            try { dir.Delete(recursive: true); } catch (IOException) { }
        }
    }
}
