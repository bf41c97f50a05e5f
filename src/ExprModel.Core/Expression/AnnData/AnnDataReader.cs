using System.Numerics;
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
/// "codes" and "categories"). Cells are obs, genes are var. The matrix is read in slices, so memory is the kept genes
/// times cells plus one slice.
/// </summary>
public static class AnnDataReader
{
    /// <summary>Elements read per slice of X (dense rows or sparse entries).</summary>
    private const int SliceElements = 1 << 20;

    /// <summary>HDF5 file signature (HDF5 file format specification, superblock).</summary>
    internal static ReadOnlySpan<byte> Signature => [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

    public static ExpressionTable Read(string path, ExpressionReadOptions? options = null)
    {
        var o = options ?? ExpressionReadOptions.Default;
        string file = Path.GetFileName(path);
        using var h5 = Open(path, file);
        var at = new Location(file);
        var notes = new List<string>();
        var cells = ReadIndex(h5, "obs", at);
        var genes = ReadIndex(h5, "var", at);
        if (o.GeneColumn is { } column) genes = ReadVarColumn(h5, column, genes.Length, at);
        var cellRegistry = new CellRegistry(file);
        for (int i = 0; i < cells.Length; i++) cellRegistry.Add(cells[i], $"dataset /obs index, row {i}");
        var registry = new GeneRegistry(file, o, notes);
        var keptSlot = new double[]?[genes.Length];
        var kept = new Dictionary<string, double[]>(StringComparer.Ordinal);
        for (int g = 0; g < genes.Length; g++)
            if (registry.Add(genes[g], $"dataset /var index, row {g}"))
                kept.Add(genes[g], keptSlot[g] = new double[cells.Length]);
        registry.Finish();

        var library = new double[cells.Length];
        var stats = new ValueStats { WholeTolerance = o.LogTransform == LogTransform.None ? 0 : 1e-6 };
        string layout;
        at.Path = "/X";
        if (!Guard(at, () => h5.LinkExists("X")))
            throw at.Error("missing: the file holds no expression matrix X.");
        var x = Guard(at, () => h5.Get("X"));
        if (x is IH5Dataset dense)
        {
            layout = "dense X";
            ReadDense(dense, cells.Length, genes.Length, o, at, stats, library, keptSlot);
        }
        else if (x is IH5Group group)
        {
            string encoding = ReadStringAttribute(group, "encoding-type", at) ?? "";
            layout = encoding;
            bool csr = encoding == "csr_matrix";
            if (!csr && encoding != "csc_matrix")
                throw at.Error($"group with encoding-type '{encoding}': only csr_matrix and csc_matrix sparse groups are read.");
            ReadSparse(group, csr, cells.Length, genes.Length, o, at, stats, library, keptSlot);
        }
        else throw at.Error("is neither a dataset nor a group.");

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
            FormatNote = $"AnnData h5ad, {layout}",
            Notes = notes,
        };
    }

    /// <summary>
    /// The obs data frame as cell metadata: string and categorical columns become labels, numeric columns become
    /// recorded read-outs (unit taken from the column name, as for text metadata).
    /// </summary>
    public static CellMetadata ReadCellMetadata(string path)
    {
        string file = Path.GetFileName(path);
        using var h5 = Open(path, file);
        var at = new Location(file);
        var cells = ReadIndex(h5, "obs", at);
        var obs = h5.Group("obs");
        string indexName = ReadStringAttribute(obs, "_index", at) ?? "_index";
        var labels = new Dictionary<string, string?[]>(StringComparer.Ordinal);
        var recorded = new List<RecordedColumn>();
        var notes = new List<string>();
        foreach (var child in Guard(at, () => obs.Children().ToList()))
        {
            if (child.Name == indexName) continue;
            at.Path = $"/obs/{child.Name}";
            if (child is IH5Group g)
            {
                string encoding = ReadStringAttribute(g, "encoding-type", at) ?? "";
                if (encoding != "categorical") { notes.Add($"{at.Path}: group with encoding '{encoding}' ignored."); continue; }
                labels[child.Name] = ReadCategorical(g, cells.Length, at);
            }
            else if (child is IH5Dataset d)
            {
                CheckLength(d, cells.Length, at);
                if (IsString(Guard(at, () => d.Type)))
                    labels[child.Name] = Guard(at, () => d.Read<string[]>());
                else
                {
                    var values = ReadNumbers(d, null, (ulong)cells.Length, at, allowNaN: true);
                    var (name, unit) = ColumnHeader.Split(child.Name);
                    recorded.Add(new RecordedColumn(child.Name, name, unit, values.Select(v => double.IsNaN(v) ? (double?)null : v).ToArray()));
                }
            }
        }
        return new CellMetadata { Source = path, CellIdColumn = indexName, CellIds = cells, Labels = labels, Recorded = recorded, Notes = notes };
    }

    private sealed class Location(string file)
    {
        public string Path { get; set; } = "/";
        public ExpressionFormatException Error(string what) => new($"{file}: dataset {Path}: {what}");
    }

    private static NativeFile Open(string path, string file)
    {
        if (!File.Exists(path)) throw new ExpressionFormatException($"{file}: file not found ({path}).");
        if (!InputFile.StartsWith(path, Signature))
            throw new ExpressionFormatException($"{file}: byte 0: not an HDF5 file (no HDF5 signature), so not an .h5ad file.");
        try { return H5File.OpenRead(path); }
        catch (Exception e) when (e is not ExpressionFormatException)
        {
            throw new ExpressionFormatException($"{file}: dataset /: cannot open as HDF5 ({e.Message}).");
        }
    }

    /// <summary>Runs a library call, turning its exceptions into a format error at the current dataset path.</summary>
    private static T Guard<T>(Location at, Func<T> read)
    {
        try { return read(); }
        catch (Exception e) when (e is not ExpressionFormatException and not OutOfMemoryException)
        {
            throw at.Error($"cannot be read ({e.GetType().Name}: {e.Message}).");
        }
    }

    private static string[] ReadIndex(NativeFile h5, string frame, Location at)
    {
        at.Path = "/" + frame;
        if (!Guard(at, () => h5.LinkExists(frame)))
            throw at.Error($"missing: the file has no {frame} data frame.");
        if (Guard(at, () => h5.Get(frame)) is not IH5Group group)
            throw at.Error("is a single dataset, not a group: an older AnnData layout (compound data frames) that is not read; " +
                "save the file again with a current AnnData version.");
        string indexName = ReadStringAttribute(group, "_index", at) ?? "_index";
        at.Path = $"/{frame}/{indexName}";
        if (!Guard(at, () => group.LinkExists(indexName)) || Guard(at, () => group.Get(indexName)) is not IH5Dataset index)
            throw at.Error($"missing: the {frame} index names no dataset.");
        if (!IsString(Guard(at, () => index.Type)))
            throw at.Error("the index must hold strings.");
        var names = Guard(at, () => index.Read<string[]>());
        if (names.Length == 0) throw at.Error("empty index.");
        return names;
    }

    /// <summary>A string or categorical var column, used as gene identifiers instead of the var index.</summary>
    private static string[] ReadVarColumn(NativeFile h5, string column, int genes, Location at)
    {
        at.Path = $"/var/{column}";
        var var = h5.Group("var");
        if (!Guard(at, () => var.LinkExists(column))) throw at.Error("missing: no such var column.");
        var obj = Guard(at, () => var.Get(column));
        string?[] values;
        if (obj is IH5Group g && ReadStringAttribute(g, "encoding-type", at) == "categorical") values = ReadCategorical(g, genes, at);
        else if (obj is IH5Dataset d && IsString(Guard(at, () => d.Type))) { CheckLength(d, genes, at); values = Guard(at, () => d.Read<string[]>()); }
        else throw at.Error("is not a string or categorical column.");
        int empty = Array.FindIndex(values, v => string.IsNullOrWhiteSpace(v));
        if (empty >= 0) throw at.Error($"row {empty}: empty gene identifier.");
        return values!;
    }

    private static string? ReadStringAttribute(IH5Object obj, string name, Location at)
    {
        if (!Guard(at, () => obj.AttributeExists(name))) return null;
        var a = Guard(at, () => obj.Attribute(name));
        if (!IsString(Guard(at, () => a.Type))) throw at.Error($"attribute '{name}' must be a string.");
        return Guard(at, () => a.Read<string>());
    }

    /// <summary>
    /// Fixed-length strings have class String; variable-length strings (what writers usually use) have class
    /// VariableLength, and reading them as strings then confirms it (a non-string sequence fails with a located error).
    /// </summary>
    private static bool IsString(IH5DataType t) => t.Class is H5DataTypeClass.String or H5DataTypeClass.VariableLength;

    private static void CheckLength(IH5Dataset d, long expected, Location at)
    {
        var dims = Guard(at, () => d.Space.Dimensions);
        if (dims.Length != 1 || (long)dims[0] != expected)
            throw at.Error($"has shape [{string.Join(", ", dims)}] where [{expected}] was expected.");
    }

    private static string?[] ReadCategorical(IH5Group g, int cells, Location at)
    {
        string basePath = at.Path;
        at.Path = basePath + "/categories";
        if (!Guard(at, () => g.LinkExists("categories"))) throw at.Error("missing.");
        var categories = Guard(at, () => g.Dataset("categories").Read<string[]>());
        at.Path = basePath + "/codes";
        if (!Guard(at, () => g.LinkExists("codes"))) throw at.Error("missing.");
        var codesSet = Guard(at, () => g.Dataset("codes"));
        CheckLength(codesSet, cells, at);
        var codes = ReadNumbers(codesSet, null, (ulong)cells, at, allowNaN: false, allowNegative: true);
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

    private static void ReadDense(IH5Dataset x, int cells, int genes, ExpressionReadOptions o, Location at, ValueStats stats, double[] library,
        double[]?[] kept)
    {
        var dims = Guard(at, () => x.Space.Dimensions);
        if (dims.Length != 2 || (long)dims[0] != cells || (long)dims[1] != genes)
            throw at.Error($"has shape [{string.Join(", ", dims)}] but obs lists {cells} cells and var lists {genes} genes.");
        int rowsPerSlice = Math.Max(1, SliceElements / Math.Max(1, genes));
        for (int r0 = 0; r0 < cells; r0 += rowsPerSlice)
        {
            int nr = Math.Min(rowsPerSlice, cells - r0);
            var selection = new HyperslabSelection(2, [(ulong)r0, 0], [(ulong)nr, (ulong)genes]);
            var block = ReadNumbers(x, selection, (ulong)nr * (ulong)genes, at, allowNaN: false, rowOffset: r0, rowLength: genes);
            for (int i = 0; i < nr; i++)
            {
                int cell = r0 + i;
                for (int g = 0; g < genes; g++)
                {
                    double v = block[(long)i * genes + g];
                    if (o.LogTransform != LogTransform.None) v = ValueParser.Undo(v, o.LogTransform);
                    stats.Add(v);
                    library[cell] += v;
                    if (kept[g] is { } s) s[cell] = v;
                }
            }
        }
    }

    private static void ReadSparse(IH5Group x, bool csr, int cells, int genes, ExpressionReadOptions o, Location at, ValueStats stats, double[] library,
        double[]?[] kept)
    {
        string shapeAt = at.Path;
        if (Guard(at, () => x.AttributeExists("shape")))
        {
            var shape = Guard(at, () => x.Attribute("shape").Read<long[]>());
            if (shape.Length != 2 || shape[0] != cells || shape[1] != genes)
                throw at.Error($"shape attribute [{string.Join(", ", shape)}] but obs lists {cells} cells and var lists {genes} genes.");
        }
        IH5Dataset Need(string name)
        {
            at.Path = $"{shapeAt}/{name}";
            if (!Guard(at, () => x.LinkExists(name)) || Guard(at, () => x.Get(name)) is not IH5Dataset d) throw at.Error("missing.");
            return d;
        }
        var dataSet = Need("data");
        var indicesSet = Need("indices");
        var indptrSet = Need("indptr");
        int major = csr ? cells : genes, minor = csr ? genes : cells;
        CheckLength(indptrSet, major + 1, at);
        var indptr = ReadNumbers(indptrSet, null, (ulong)major + 1, at, allowNaN: false);
        long nnz = (long)indptr[major];
        if (indptr[0] != 0) throw at.Error("row 0: must be 0.");
        for (int k = 1; k <= major; k++)
            if (indptr[k] < indptr[k - 1]) throw at.Error($"row {k}: decreases ({indptr[k - 1]} then {indptr[k]}).");
        at.Path = $"{shapeAt}/data";
        CheckLength(dataSet, nnz, at);
        at.Path = $"{shapeAt}/indices";
        CheckLength(indicesSet, nnz, at);

        int row = 0;
        for (long start = 0; start < nnz; start += SliceElements)
        {
            ulong count = (ulong)Math.Min(SliceElements, nnz - start);
            at.Path = $"{shapeAt}/data";
            var data = ReadNumbers(dataSet, new HyperslabSelection((ulong)start, count), count, at, allowNaN: false, rowOffset: start);
            at.Path = $"{shapeAt}/indices";
            var indices = ReadNumbers(indicesSet, new HyperslabSelection((ulong)start, count), count, at, allowNaN: false, rowOffset: start);
            for (int e = 0; e < (int)count; e++)
            {
                long k = start + e;
                while (k >= indptr[row + 1]) row++;
                double idx = indices[e];
                if (idx < 0 || idx >= minor) throw at.Error($"element {k}: index {idx} is outside 0..{minor - 1}.");
                int cell = csr ? row : (int)idx, gene = csr ? (int)idx : row;
                double v = data[e];
                if (o.LogTransform != LogTransform.None) v = ValueParser.Undo(v, o.LogTransform);
                stats.Add(v);
                library[cell] += v;
                if (kept[gene] is { } s) s[cell] += v;
            }
        }
        if (nnz < (long)cells * genes) stats.Add(0); // implicit zeros
    }

    /// <summary>Reads numbers of any HDF5 integer or float type as doubles, checking each against what expression data may hold.</summary>
    private static double[] ReadNumbers(IH5Dataset d, Selection? selection, ulong count, Location at, bool allowNaN,
        bool allowNegative = false, long rowOffset = 0, int rowLength = 0)
    {
        var type = Guard(at, () => d.Type);
        double[] values = type.Class switch
        {
            H5DataTypeClass.FloatingPoint when type.Size == 4 => Convert<float>(d, selection, count, at),
            H5DataTypeClass.FloatingPoint when type.Size == 8 => Convert<double>(d, selection, count, at),
            H5DataTypeClass.FixedPoint => (type.Size, type.FixedPoint.IsSigned) switch
            {
                (1, true) => Convert<sbyte>(d, selection, count, at),
                (1, false) => Convert<byte>(d, selection, count, at),
                (2, true) => Convert<short>(d, selection, count, at),
                (2, false) => Convert<ushort>(d, selection, count, at),
                (4, true) => Convert<int>(d, selection, count, at),
                (4, false) => Convert<uint>(d, selection, count, at),
                (8, true) => Convert<long>(d, selection, count, at),
                (8, false) => Convert<ulong>(d, selection, count, at),
                _ => throw at.Error($"integer size {type.Size} bytes is not read."),
            },
            _ => throw at.Error($"holds {type.Class} values, not numbers."),
        };
        for (long i = 0; i < values.Length; i++)
        {
            double v = values[i];
            string? problem = double.IsNaN(v) ? (allowNaN ? null : "NaN")
                : double.IsInfinity(v) ? "an infinite value"
                : v < 0 && !allowNegative && !allowNaN ? $"negative value {v}" : null;
            if (problem is not null)
            {
                string where = rowLength > 0 ? $"row {rowOffset + i / rowLength}, column {i % rowLength}" : $"element {rowOffset + i}";
                throw at.Error($"{where}: {problem} (expression levels are finite and >= 0).");
            }
        }
        return values;
    }

    private static double[] Convert<T>(IH5Dataset d, Selection? selection, ulong count, Location at) where T : unmanaged, INumberBase<T>
    {
        var raw = Guard(at, () => selection is null ? d.Read<T[]>() : d.Read<T[]>(fileSelection: selection, memoryDims: [count]));
        var result = new double[raw.Length];
        for (int i = 0; i < raw.Length; i++) result[i] = double.CreateTruncating(raw[i]);
        return result;
    }
}
