using ExprModel.Core.Expression.Text;
using ExprModel.Core.Expression.Units;
using PureHDF;
using PureHDF.Selections;

namespace ExprModel.Core.Expression.AnnData;

/// <summary>
/// Reads one AnnData matrix (X, a layer or raw/X; cells x genes) for a range of cells: a dense dataset by a hyperslab
/// of its rows; a csr_matrix group by reading indptr for the range's rows and then only the data and indices elements
/// those rows hold (hyperslab reads, so an HDF5 library decompresses only the chunks that hold them); a csc_matrix
/// group, whose every gene column mixes all cells, by streaming data and indices in slices and keeping the range's
/// entries (memory stays flat, but the whole matrix is read).
/// </summary>
internal static class AnnDataMatrixReader
{
    /// <summary>Elements read per slice (dense rows or sparse entries).</summary>
    private const int SliceElements = 1 << 20;

    /// <summary>Elements looked at to judge whether another matrix holds whole numbers.</summary>
    private const int ProbeElements = 1 << 16;

    /// <summary>Reads the matrix into <paramref name="library"/> and <paramref name="kept"/> (both indexed by cell within the range); returns its
    /// layout.</summary>
    public static string Read(IH5Object x, int cells, int genes, CellRange range, ExpressionReadOptions o, H5Location at, ValueStats stats,
        double[] library, double[]?[] kept)
    {
        if (x is IH5Dataset dense)
        {
            ReadDense(dense, cells, genes, range, o, at, stats, library, kept);
            return "dense";
        }
        if (x is not IH5Group group) throw at.Error("is neither a dataset nor a group.");
        string encoding = at.StringAttribute(group, "encoding-type") ?? "";
        bool csr = encoding == "csr_matrix";
        if (!csr && encoding != "csc_matrix")
            throw at.Error($"group with encoding-type '{encoding}': only csr_matrix and csc_matrix sparse groups are read.");
        ReadSparse(group, csr, cells, genes, range, o, at, stats, library, kept);
        return encoding;
    }

    /// <summary>True when the first values of a matrix are all whole numbers, at least one of them not zero (a counts matrix, by its look).</summary>
    public static bool LooksLikeCounts(IH5Object x, H5Location at) => Sample(x, at) is { } sample && sample.Any(v => v != 0) && sample.All(IsWhole);

    /// <summary>The matrix's first stored values (up to <see cref="ProbeElements"/>), or null when it cannot be read as a matrix.</summary>
    public static double[]? Sample(IH5Object x, H5Location at)
    {
        try
        {
            if (x is IH5Dataset d)
            {
                var dims = d.Space.Dimensions;
                if (dims.Length != 2 || dims[0] == 0 || dims[1] == 0) return null;
                ulong rows = Math.Max(1, Math.Min(dims[0], (ulong)ProbeElements / dims[1]));
                return H5Numbers.Read(d, new HyperslabSelection(2, [0, 0], [rows, dims[1]]), rows * dims[1], at, allowNaN: false);
            }
            if (x is IH5Group g && g.LinkExists("data") && g.Get("data") is IH5Dataset data)
            {
                long n = Math.Min(at.Length(data), ProbeElements);
                return n == 0 ? [] : H5Numbers.Slice(data, 0, n, at);
            }
            return null;
        }
        catch (ExpressionFormatException) { return null; }
    }

    public static bool IsWhole(double v) => v == Math.Round(v);

    /// <summary>How the matrix is stored (dense, csr_matrix, csc_matrix or the group's own encoding) and its shape when it says it.</summary>
    public static (string Layout, long[]? Shape) Describe(IH5Object x, H5Location at)
    {
        if (x is IH5Dataset d) return ("dense", at.Guard(() => d.Space.Dimensions).Select(v => (long)v).ToArray());
        if (x is not IH5Group g) return ("neither a dataset nor a group", null);
        string encoding = at.StringAttribute(g, "encoding-type") ?? "group without encoding-type";
        long[]? shape = at.Guard(() => g.AttributeExists("shape")) ? at.Guard(() => g.Attribute("shape").Read<long[]>()) : null;
        return (encoding, shape);
    }

    private static void ReadDense(IH5Dataset x, int cells, int genes, CellRange range, ExpressionReadOptions o, H5Location at, ValueStats stats,
        double[] library, double[]?[] kept)
    {
        var dims = at.Guard(() => x.Space.Dimensions);
        if (dims.Length != 2 || (long)dims[0] != cells || (long)dims[1] != genes)
            throw at.Error($"has shape [{string.Join(", ", dims)}] but obs lists {cells} cells and the gene table lists {genes} genes.");
        int rowsPerSlice = Math.Max(1, SliceElements / Math.Max(1, genes));
        for (int r0 = range.Start; r0 < range.End; r0 += rowsPerSlice)
        {
            o.Cancel.ThrowIfCancellationRequested();
            int nr = Math.Min(rowsPerSlice, range.End - r0);
            var selection = new HyperslabSelection(2, [(ulong)r0, 0], [(ulong)nr, (ulong)genes]);
            var block = H5Numbers.Read(x, selection, (ulong)nr * (ulong)genes, at, allowNaN: false, first: r0, rowLength: genes, meter: o.Meter);
            for (int i = 0; i < nr; i++)
            {
                int cell = r0 - range.Start + i;
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

    private static void ReadSparse(IH5Group x, bool csr, int cells, int genes, CellRange range, ExpressionReadOptions o, H5Location at, ValueStats stats,
        double[] library, double[]?[] kept)
    {
        string groupPath = at.Path;
        if (at.Guard(() => x.AttributeExists("shape")))
        {
            var shape = at.Guard(() => x.Attribute("shape").Read<long[]>());
            if (shape.Length != 2 || shape[0] != cells || shape[1] != genes)
                throw at.Error($"shape attribute [{string.Join(", ", shape)}] but obs lists {cells} cells and the gene table lists {genes} genes.");
        }
        IH5Dataset Need(string name)
        {
            at.Path = $"{groupPath}/{name}";
            if (!at.Guard(() => x.LinkExists(name)) || at.Guard(() => x.Get(name)) is not IH5Dataset d) throw at.Error("missing.");
            return d;
        }
        var dataSet = Need("data");
        var indicesSet = Need("indices");
        var indptrSet = Need("indptr");
        int major = csr ? cells : genes, minor = csr ? genes : cells;
        at.CheckLength(indptrSet, major + 1);

        // The major-axis pointers: for CSR only the range's rows (and the last pointer, to check the data length).
        int first = csr ? range.Start : 0, rows = csr ? range.Count : major;
        var ptr = H5Numbers.Slice(indptrSet, first, rows + 1, at, o.Meter);
        double last = first + rows == major ? ptr[rows] : H5Numbers.Slice(indptrSet, major, 1, at, o.Meter)[0];
        if (first == 0 && ptr[0] != 0) throw at.Error("row 0: must be 0.");
        for (int k = 1; k <= rows; k++)
            if (ptr[k] < ptr[k - 1]) throw at.Error($"row {first + k}: decreases ({ptr[k - 1]} then {ptr[k]}).");
        long nnz = (long)last;
        at.Path = $"{groupPath}/data";
        at.CheckLength(dataSet, nnz);
        at.Path = $"{groupPath}/indices";
        at.CheckLength(indicesSet, nnz);
        at.Path = $"{groupPath}/indptr";
        if (ptr[rows] > nnz) throw at.Error($"row {first + rows}: pointer {ptr[rows]} lies past the {nnz} data elements.");

        long from = (long)ptr[0], to = (long)ptr[rows], keptEntries = 0;
        int row = 0;
        for (long start = from; start < to; start += SliceElements)
        {
            o.Cancel.ThrowIfCancellationRequested();
            long count = Math.Min(SliceElements, to - start);
            at.Path = $"{groupPath}/data";
            var data = H5Numbers.Slice(dataSet, start, count, at, o.Meter);
            at.Path = $"{groupPath}/indices";
            var indices = H5Numbers.Slice(indicesSet, start, count, at, o.Meter);
            for (int e = 0; e < (int)count; e++)
            {
                long k = start + e;
                while (k >= ptr[row + 1]) row++;
                double idx = indices[e];
                if (idx < 0 || idx >= minor) throw at.Error($"element {k}: index {idx} is outside 0..{minor - 1}.");
                int cell, gene;
                if (csr) (cell, gene) = (row, (int)idx);
                else
                {
                    if (!range.Contains((long)idx)) continue;
                    (cell, gene) = ((int)idx - range.Start, first + row);
                }
                keptEntries++;
                double v = data[e];
                if (o.LogTransform != LogTransform.None) v = ValueParser.Undo(v, o.LogTransform);
                stats.Add(v);
                library[cell] += v;
                if (kept[gene] is { } s) s[cell] += v;
            }
        }
        if (keptEntries < (long)range.Count * genes) stats.Add(0); // implicit zeros
    }
}
