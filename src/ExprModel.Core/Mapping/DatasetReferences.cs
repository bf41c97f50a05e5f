using System.Globalization;
using System.Text.Json;
using System.Text.Json.Nodes;
using ExprModel.Core.Expression;

namespace ExprModel.Core.Mapping;

/// <summary>
/// The whole-dataset numbers a part of an atlas needs to build its cells' models exactly as a full read would: each
/// entry's reference (what <see cref="DensityRule"/> divides expression by: the dataset median, or the reference
/// group's mean) and the unit the full read decided. Computed once from a full read, written as a small JSON file
/// (our own format, "exprmodel-dataset-references"; doubles written round-trip exact), then read by every shard,
/// which checks that the file was made from the same table with the same settings. For per-cell shrinkage the file also
/// holds the gamma-Poisson priors fitted over every cell (optional section "shrinkage"), and the entries' references are
/// then taken over the shrunk values, as the unsharded run takes them.
/// </summary>
public sealed record DatasetReferences
{
    public const string Format = "exprmodel-dataset-references";

    /// <summary>The table's file name and size in bytes (a directory's files summed), to refuse references of another table.</summary>
    public required string Source { get; init; }
    public required long SourceBytes { get; init; }
    public required int Cells { get; init; }
    public required ExpressionUnit Unit { get; init; }
    /// <summary>The reading and mapping settings the references depend on, in words (matrix, transform, reference, overrides).</summary>
    public required string Settings { get; init; }
    /// <summary>Reference expression by entry id.</summary>
    public required IReadOnlyDictionary<string, double> Entries { get; init; }
    /// <summary>The per-cell shrinkage priors by gene and prior set, when the references were made for <c>--shrink group</c>
    /// (empty when the table holds no counts, so nothing is shrunk); null without shrinkage.</summary>
    public ShrinkagePriors? Shrinkage { get; init; }

    /// <summary>The references of a fully read dataset under <paramref name="rule"/>.</summary>
    /// <exception cref="ArgumentException">The rule names a reference group the dataset does not have.</exception>
    public static DatasetReferences Compute(ExpressionDataset data, MappingReport report, DensityRule rule, string settings)
    {
        int[]? referenceCells = null;
        if (rule.Reference == DensityReference.ReferenceGroup
            && (data.Groups is null || !data.Groups.Members.TryGetValue(rule.ReferenceGroup!, out referenceCells)))
            throw new ArgumentException($"Reference group '{rule.ReferenceGroup}' is not among the dataset's groups.");
        var entries = new SortedDictionary<string, double>(StringComparer.Ordinal);
        foreach (var (entry, perCell) in report.EntryExpression()) entries[entry] = rule.ReferenceOf(perCell, referenceCells);
        return new DatasetReferences
        {
            Source = Path.GetFileName(Path.TrimEndingDirectorySeparator(data.Table.Source)),
            SourceBytes = SizeOf(data.Table.Source),
            Cells = data.Table.CellIds.Count,
            Unit = data.Table.Unit,
            Settings = settings,
            Entries = entries,
        };
    }

    /// <summary>Bytes of a file, or of every file in a directory (a Matrix Market directory).</summary>
    public static long SizeOf(string path) => Directory.Exists(path)
        ? new DirectoryInfo(path).EnumerateFiles().Sum(f => f.Length)
        : File.Exists(path) ? new FileInfo(path).Length : 0;

    public string ToJson()
    {
        var entries = new JsonObject();
        foreach (var (k, v) in Entries) entries[k] = v;
        var o = new JsonObject
        {
            ["format"] = Format,
            ["source"] = Source,
            ["sourceBytes"] = SourceBytes,
            ["cells"] = Cells,
            ["unit"] = Unit.ToString(),
            ["settings"] = Settings,
            ["entries"] = entries,
        };
        if (Shrinkage is { } shrinkage)
        {
            var genes = new JsonObject();
            foreach (var (gene, priors) in shrinkage.All)
            {
                var sets = new JsonObject();
                foreach (var (set, prior) in priors)
                    sets[set] = new JsonObject { ["meanCpm"] = prior.MeanCpm, ["rateVariance"] = prior.RateVariance, ["cells"] = prior.Cells };
                genes[gene] = sets;
            }
            o["shrinkage"] = new JsonObject
            {
                ["method"] = "empirical-Bayes gamma-Poisson priors (mean CPM and between-cell rate variance) per gene and prior set, "
                    + "fitted over every cell of the table (Marshall 1991)",
                ["priors"] = genes,
            };
        }
        o["caution"] = Models.ResearchCaution.Text;
        return o.ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n";
    }

    private static ShrinkagePriors ReadShrinkage(string file, JsonObject section)
    {
        if (section["priors"] is not JsonObject genes) throw new FormatException($"{file}: field 'shrinkage.priors' is missing or not an object.");
        var priors = new ShrinkagePriors();
        foreach (var (gene, node) in genes)
        {
            if (node is not JsonObject sets) throw new FormatException($"{file}: field 'shrinkage.priors.{gene}' is not an object.");
            foreach (var (set, value) in sets)
            {
                string where = $"shrinkage.priors.{gene}.{set}";
                if (value is not JsonObject prior) throw new FormatException($"{file}: field '{where}' is not an object.");
                double Number(string name) => prior[name] is JsonValue v && v.TryGetValue<double>(out var d) && double.IsFinite(d) && d >= 0 ? d
                    : throw new FormatException($"{file}: field '{where}.{name}' is not a number >= 0.");
                int cells = prior["cells"] is JsonValue c && c.TryGetValue<int>(out var n) && n >= 0 ? n
                    : throw new FormatException($"{file}: field '{where}.cells' is not a whole number >= 0.");
                priors.Add(gene, set, new Expression.Shrinkage.GammaPoissonPrior(Number("meanCpm"), Number("rateVariance"), cells));
            }
        }
        return priors;
    }

    /// <exception cref="FormatException">The file is not a references file or a field is missing or malformed (names the file and field).</exception>
    public static DatasetReferences Read(string path)
    {
        string file = Path.GetFileName(path);
        JsonObject o;
        try { o = JsonNode.Parse(File.ReadAllText(path)) as JsonObject ?? throw new FormatException($"{file}: not a JSON object."); }
        catch (JsonException e) { throw new FormatException($"{file}: line {e.LineNumber + 1}: not JSON ({e.Message})."); }
        T Field<T>(string name)
        {
            if (o[name] is not JsonValue node) throw new FormatException($"{file}: field '{name}' is missing or not a value.");
            return node.TryGetValue<T>(out var v) ? v : throw new FormatException($"{file}: field '{name}' is not a {typeof(T).Name}.");
        }
        if (Field<string>("format") != Format) throw new FormatException($"{file}: field 'format' is not '{Format}'.");
        if (!Enum.TryParse<ExpressionUnit>(Field<string>("unit"), out var unit)) throw new FormatException($"{file}: field 'unit' names no unit.");
        if (o["entries"] is not JsonObject entries) throw new FormatException($"{file}: field 'entries' is missing or not an object.");
        var values = new SortedDictionary<string, double>(StringComparer.Ordinal);
        foreach (var (k, v) in entries)
            values[k] = v is JsonValue jv && jv.TryGetValue<double>(out var d) && double.IsFinite(d) && d >= 0 ? d
                : throw new FormatException($"{file}: field 'entries.{k}' is not a number >= 0.");
        return new DatasetReferences
        {
            Source = Field<string>("source"),
            SourceBytes = Field<long>("sourceBytes"),
            Cells = Field<int>("cells"),
            Unit = unit,
            Settings = Field<string>("settings"),
            Entries = values,
            Shrinkage = o["shrinkage"] switch
            {
                null => null,
                JsonObject section => ReadShrinkage(file, section),
                _ => throw new FormatException($"{file}: field 'shrinkage' is not an object."),
            },
        };
    }

    /// <summary>Why these references do not belong to a table of <paramref name="cells"/> cells at <paramref name="tablePath"/> read with
    /// <paramref name="settings"/> (null when they do).</summary>
    public string? Mismatch(string tablePath, int cells, string settings)
    {
        string name = Path.GetFileName(Path.TrimEndingDirectorySeparator(tablePath));
        long bytes = SizeOf(tablePath);
        if (name != Source || bytes != SourceBytes)
            return string.Create(CultureInfo.InvariantCulture, $"made from {Source} ({SourceBytes} bytes), not from {name} ({bytes} bytes)");
        if (cells != Cells) return $"made for {Cells} cells, the table holds {cells}";
        if (settings != Settings) return $"made with settings '{Settings}', this run's are '{settings}'{Differences(Settings, settings)}";
        return null;
    }

    /// <summary>" (they differ in: shrink=none there, shrink=group here)" for settings written as "name=value; ..." (empty otherwise).</summary>
    private static string Differences(string there, string here)
    {
        static Dictionary<string, string>? Parse(string s)
        {
            var d = new Dictionary<string, string>(StringComparer.Ordinal);
            foreach (var part in s.Split("; "))
            {
                int eq = part.IndexOf('=');
                if (eq <= 0 || !d.TryAdd(part[..eq], part[(eq + 1)..])) return null;
            }
            return d;
        }
        if (Parse(there) is not { } a || Parse(here) is not { } b) return "";
        var names = a.Keys.Union(b.Keys).Where(k => a.GetValueOrDefault(k) != b.GetValueOrDefault(k)).ToList();
        if (names.Count == 0) return "";
        static string Side(Dictionary<string, string> d, string k) => d.TryGetValue(k, out var v) ? $"{k}={v}" : $"no {k}";
        return " (they differ in: " + string.Join("; ", names.Select(k => $"{Side(a, k)} there, {Side(b, k)} here")) + ")";
    }
}
