using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Expression.Text;
using ExprModel.Core.Expression.Units;
using PureHDF;
using PureHDF.Selections;
using PureHDF.VOL.Native;

namespace ExprModel.Core.Expression.AnnData;

/// <summary>
/// Reads AnnData .h5ad files (HDF5; the open on-disk layout: an n_obs x n_var matrix "X", either a dense dataset or a
/// group "X" with "data", "indices" and "indptr" for CSR or CSC sparse storage and a "shape" attribute; data frames
/// "obs" and "var" whose "_index" attribute names the dataset holding row names; categorical columns as groups of
/// "codes" and "categories"). Cells are obs, genes are var. The matrix is X unless the options choose a layer
/// (layers/NAME) or raw/X (genes then from raw/var). With a cell range only those obs rows are read
/// (<see cref="AnnDataMatrixReader"/>). The matrix is read in slices, so memory is the kept genes times the cells read
/// plus one slice.
/// </summary>
public static class AnnDataReader
{
    /// <summary>HDF5 file signature (HDF5 file format specification, superblock).</summary>
    internal static ReadOnlySpan<byte> Signature => [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

    public static ExpressionTable Read(string path, ExpressionReadOptions? options = null)
    {
        var o = options ?? ExpressionReadOptions.Default;
        string file = Path.GetFileName(path);
        using var h5 = Open(path, file, o.Meter);
        var at = new H5Location(file);
        var notes = new List<string>();
        var matrix = o.Matrix ?? MatrixChoice.X;
        int total = CellCount(h5, at);
        var range = o.Cells ?? new CellRange(0, total);
        range.CheckWithin(total, file);
        var cells = ReadIndex(h5, "obs", at, range);
        var genes = ReadIndex(h5, matrix.GeneFrame, at);
        if (o.GeneColumn is { } column) genes = ReadGeneColumn(h5, matrix.GeneFrame, column, genes.Length, at);
        var cellRegistry = new CellRegistry(file);
        for (int i = 0; i < cells.Length; i++) cellRegistry.Add(cells[i], $"dataset /obs index, row {range.Start + i}");
        var registry = new GeneRegistry(file, o, notes);
        var keptSlot = new double[]?[genes.Length];
        var kept = new Dictionary<string, double[]>(StringComparer.Ordinal);
        for (int g = 0; g < genes.Length; g++)
            if (registry.Add(genes[g], $"dataset /{matrix.GeneFrame} index, row {g}"))
                kept.Add(genes[g], keptSlot[g] = new double[cells.Length]);
        registry.Finish();

        var library = new double[cells.Length];
        var stats = new ValueStats { WholeTolerance = o.LogTransform == LogTransform.None ? 0 : 1e-6 };
        at.Path = "/" + matrix.MatrixPath;
        if (!at.Guard(() => h5.LinkExists(matrix.MatrixPath)))
            throw at.Error(matrix == MatrixChoice.X ? "missing: the file holds no expression matrix X."
                : $"missing: the file holds no matrix {matrix.MatrixPath} (matrix choice '{matrix.Spelling}'{Available(h5)}).");
        var x = at.Guard(() => h5.Get(matrix.MatrixPath));
        string layout = AnnDataMatrixReader.Read(x, total, genes.Length, range, o, at, stats, library, keptSlot);
        at.Path = "/" + matrix.MatrixPath;
        if (o.Matrix is null && UnitDecision.LooksLogTransformed(o, stats) && CountsElsewhere(h5, at) is { } counts)
            throw at.Error(LogHint(stats.Max, counts));
        if (o.Matrix is not null) notes.Add($"values from /{matrix.MatrixPath} (matrix choice '{matrix.Spelling}').");
        if (o.Cells is not null) notes.Add($"read {range} of {total} (a part of the file); a unit not stated is decided from these cells' values.");

        var (unit, unitNote) = UnitDecision.Decide(file, o, stats, library, notes);
        return new ExpressionTable
        {
            Source = path,
            CellIds = cells,
            Genes = kept,
            LibrarySizes = library,
            TotalGeneCount = registry.Total,
            Unit = unit,
            UnitNote = unitNote,
            Orientation = TableOrientation.CellsAsRows,
            OrientationNote = "cells as rows: fixed by the AnnData layout (X is cells x genes)",
            FormatNote = $"AnnData h5ad, {(matrix == MatrixChoice.X ? "" : matrix.MatrixPath + ", ")}{(layout == "dense" ? "dense X" : layout)}",
            Notes = notes,
        };
    }

    /// <summary>How many cells (obs rows) the file holds, from the obs index's shape alone (nothing else is read).</summary>
    public static int CountCells(string path, ExpressionReadOptions? options = null)
    {
        string file = Path.GetFileName(path);
        using var h5 = Open(path, file, options?.Meter);
        return CellCount(h5, new H5Location(file));
    }

    /// <summary>
    /// What follows "FILE: dataset /X: " when X looks log-transformed and another matrix holds counts (the reader's
    /// refusal, the Load page's hint).
    /// </summary>
    internal static string LogHint(double largest, MatrixChoice counts) =>
        $"values look log-transformed (not whole numbers, largest {largest:G4}); {counts.MatrixPath} holds whole numbers: " +
        $"use --matrix {counts.Spelling} (read options: matrix '{counts.Spelling}') to model its counts, or state the transform to undo it.";

    /// <summary>
    /// The file's size and matrices (X, each layer, raw/X) with a look at each one's first values, for a user to pick
    /// one before reading (the Load page). The hint is the reader's own text, judged on X's first values (at most 65,536)
    /// where the reader judges all of them, so for a larger X the largest value it names may be lower.
    /// </summary>
    /// <exception cref="ExpressionFormatException">Not an HDF5 file, or obs or var missing or unreadable (file and dataset named).</exception>
    public static AnnDataOverview Describe(string path)
    {
        string file = Path.GetFileName(path);
        using var h5 = Open(path, file, null);
        var at = new H5Location(file);
        int cells = CellCount(h5, at);
        int genes = (int)Math.Min(int.MaxValue, at.Length(IndexDataset(h5, "var", at)));
        var choices = new List<MatrixChoice>();
        if (h5.LinkExists("X")) choices.Add(MatrixChoice.X);
        if (h5.LinkExists("layers") && h5.Get("layers") is IH5Group layers)
            choices.AddRange(layers.Children().Select(c => c.Name).Order(StringComparer.Ordinal).Select(MatrixChoice.Layer));
        if (h5.LinkExists("raw") && h5.Get("raw") is IH5Group raw && raw.LinkExists("X")) choices.Add(MatrixChoice.Raw);
        if (choices.Count == 0) throw new H5Location(file) { Path = "/X" }.Error("missing: the file holds no expression matrix (no X, layers or raw/X).");
        var matrices = new List<AnnDataMatrixSummary>();
        foreach (var c in choices)
        {
            var where = new H5Location(file) { Path = "/" + c.MatrixPath };
            var x = where.Guard(() => h5.Get(c.MatrixPath));
            var (layout, shape) = AnnDataMatrixReader.Describe(x, where);
            var sample = AnnDataMatrixReader.Sample(x, where) ?? [];
            matrices.Add(new AnnDataMatrixSummary(c, layout, shape, sample.Length, sample.All(AnnDataMatrixReader.IsWhole),
                sample.Length == 0 ? 0 : sample.Max()));
        }
        string? hint = null;
        MatrixChoice? suggested = null;
        if (matrices[0] is { Choice.Spelling: "X", AllWhole: false, Sampled: > 0 } main && main.Largest <= UnitDecision.LogScaleMax
            && CountsElsewhere(h5, at) is { } counts)
        {
            suggested = counts;
            hint = new H5Location(file) { Path = "/X" }.Error(LogHint(main.Largest, counts)).Message;
        }
        return new AnnDataOverview(file, cells, genes, matrices, hint, suggested);
    }

    /// <summary>The first layer, or raw/X, whose values look like counts (whole numbers), for the log-transform hint.</summary>
    private static MatrixChoice? CountsElsewhere(NativeFile h5, H5Location at)
    {
        var candidates = new List<MatrixChoice>();
        if (h5.LinkExists("layers") && h5.Get("layers") is IH5Group layers)
            candidates.AddRange(layers.Children().Select(c => c.Name).Order(StringComparer.Ordinal).Select(MatrixChoice.Layer));
        if (h5.LinkExists("raw") && h5.Group("raw").LinkExists("X")) candidates.Add(MatrixChoice.Raw);
        // "counts" is the usual layer name; look at it first.
        foreach (var c in candidates.OrderBy(c => c.Spelling == "layer:counts" ? 0 : 1))
        {
            var probeAt = new H5Location(at.File) { Path = "/" + c.MatrixPath };
            if (AnnDataMatrixReader.LooksLikeCounts(h5.Get(c.MatrixPath), probeAt)) return c;
        }
        return null;
    }

    private static string Available(NativeFile h5)
    {
        var names = new List<string> { "X" };
        if (h5.LinkExists("layers") && h5.Get("layers") is IH5Group layers) names.AddRange(layers.Children().Select(c => "layer:" + c.Name));
        if (h5.LinkExists("raw") && h5.Get("raw") is IH5Group raw && raw.LinkExists("X")) names.Add("raw");
        return "; the file has: " + string.Join(", ", names);
    }

    /// <summary>
    /// The obs data frame as cell metadata: string and categorical columns become labels, numeric columns become
    /// recorded read-outs (unit taken from the column name, as for text metadata).
    /// </summary>
    public static CellMetadata ReadCellMetadata(string path)
    {
        string file = Path.GetFileName(path);
        using var h5 = Open(path, file, null);
        var at = new H5Location(file);
        var cells = ReadIndex(h5, "obs", at);
        var obs = h5.Group("obs");
        string indexName = at.StringAttribute(obs, "_index") ?? "_index";
        var labels = new Dictionary<string, string?[]>(StringComparer.Ordinal);
        var recorded = new List<RecordedColumn>();
        var notes = new List<string>();
        foreach (var child in at.Guard(() => obs.Children().ToList()))
        {
            if (child.Name == indexName) continue;
            at.Path = $"/obs/{child.Name}";
            if (child is IH5Group g)
            {
                string encoding = at.StringAttribute(g, "encoding-type") ?? "";
                if (encoding != "categorical") { notes.Add($"{at.Path}: group with encoding '{encoding}' ignored."); continue; }
                labels[child.Name] = ReadCategorical(g, cells.Length, at);
            }
            else if (child is IH5Dataset d)
            {
                at.CheckLength(d, cells.Length);
                if (H5Location.IsString(at.Guard(() => d.Type)))
                    labels[child.Name] = at.Guard(() => d.Read<string[]>());
                else
                {
                    var values = H5Numbers.Read(d, null, (ulong)cells.Length, at, allowNaN: true);
                    var (name, unit) = ColumnHeader.Split(child.Name);
                    recorded.Add(new RecordedColumn(child.Name, name, unit, values.Select(v => double.IsNaN(v) ? (double?)null : v).ToArray()));
                }
            }
        }
        return new CellMetadata { Source = path, CellIdColumn = indexName, CellIds = cells, Labels = labels, Recorded = recorded, Notes = notes };
    }

    private static NativeFile Open(string path, string file, ReadMeter? meter)
    {
        if (!File.Exists(path)) throw new ExpressionFormatException($"{file}: file not found ({path}).");
        if (!InputFile.StartsWith(path, Signature))
            throw new ExpressionFormatException($"{file}: byte 0: not an HDF5 file (no HDF5 signature), so not an .h5ad file.");
        try
        {
            if (meter is null) return H5File.OpenRead(path);
            // Counted reads (tests, benchmarks): the library reads through a stream that adds up the bytes it takes.
            var stream = new MeteredStream(new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16), meter);
            return H5File.Open(stream, leaveOpen: false);
        }
        catch (Exception e) when (e is not ExpressionFormatException)
        {
            throw new ExpressionFormatException($"{file}: dataset /: cannot open as HDF5 ({e.Message}).");
        }
    }

    /// <summary>The obs index dataset, checked to be a string dataset.</summary>
    private static IH5Dataset IndexDataset(NativeFile h5, string frame, H5Location at)
    {
        at.Path = "/" + frame;
        if (!at.Guard(() => h5.LinkExists(frame)))
            throw at.Error($"missing: the file has no {frame} data frame.");
        if (at.Guard(() => h5.Get(frame)) is not IH5Group group)
            throw at.Error("is a single dataset, not a group: an older AnnData layout (compound data frames) that is not read; " +
                "save the file again with a current AnnData version.");
        string indexName = at.StringAttribute(group, "_index") ?? "_index";
        at.Path = $"/{frame}/{indexName}";
        if (!at.Guard(() => group.LinkExists(indexName)) || at.Guard(() => group.Get(indexName)) is not IH5Dataset index)
            throw at.Error($"missing: the {frame} index names no dataset.");
        if (!H5Location.IsString(at.Guard(() => index.Type)))
            throw at.Error("the index must hold strings.");
        return index;
    }

    private static int CellCount(NativeFile h5, H5Location at)
    {
        long n = at.Length(IndexDataset(h5, "obs", at));
        if (n == 0) throw at.Error("empty index.");
        if (n > int.MaxValue) throw at.Error($"{n} cells: more than one read can index.");
        return (int)n;
    }

    /// <summary>A data frame's index; for obs, only the rows of <paramref name="range"/> when given (a hyperslab of the index).</summary>
    private static string[] ReadIndex(NativeFile h5, string frame, H5Location at, CellRange? range = null)
    {
        var index = IndexDataset(h5, frame, at);
        long length = at.Length(index);
        if (length == 0) throw at.Error("empty index.");
        if (range is { } r && (r.Start != 0 || r.Count != length))
            return at.Guard(() => index.Read<string[]>(fileSelection: new HyperslabSelection((ulong)r.Start, (ulong)r.Count), memoryDims: [(ulong)r.Count]));
        return at.Guard(() => index.Read<string[]>());
    }

    /// <summary>A string or categorical column of the gene data frame, used as gene identifiers instead of its index.</summary>
    private static string[] ReadGeneColumn(NativeFile h5, string frame, string column, int genes, H5Location at)
    {
        at.Path = $"/{frame}/{column}";
        var var = h5.Group(frame);
        if (!at.Guard(() => var.LinkExists(column))) throw at.Error($"missing: no such {frame} column.");
        var obj = at.Guard(() => var.Get(column));
        string?[] values;
        if (obj is IH5Group g && at.StringAttribute(g, "encoding-type") == "categorical") values = ReadCategorical(g, genes, at);
        else if (obj is IH5Dataset d && H5Location.IsString(at.Guard(() => d.Type))) { at.CheckLength(d, genes); values = at.Guard(() => d.Read<string[]>()); }
        else throw at.Error("is not a string or categorical column.");
        int empty = Array.FindIndex(values, v => string.IsNullOrWhiteSpace(v));
        if (empty >= 0) throw at.Error($"row {empty}: empty gene identifier.");
        return values!;
    }

    private static string?[] ReadCategorical(IH5Group g, int cells, H5Location at)
    {
        string basePath = at.Path;
        at.Path = basePath + "/categories";
        if (!at.Guard(() => g.LinkExists("categories"))) throw at.Error("missing.");
        var categories = at.Guard(() => g.Dataset("categories").Read<string[]>());
        at.Path = basePath + "/codes";
        if (!at.Guard(() => g.LinkExists("codes"))) throw at.Error("missing.");
        var codesSet = at.Guard(() => g.Dataset("codes"));
        at.CheckLength(codesSet, cells);
        var codes = H5Numbers.Read(codesSet, null, (ulong)cells, at, allowNaN: false, allowNegative: true);
        var labels = new string?[cells];
        for (int i = 0; i < cells; i++)
        {
            // Code -1 marks a missing label in this layout.
            long c = (long)codes[i];
            if (c == -1) continue;
            if (c < 0 || c >= categories.Length) throw at.Error($"row {i}: code {c} is outside 0..{categories.Length - 1}.");
            labels[i] = categories[c];
        }
        return labels;
    }
}
