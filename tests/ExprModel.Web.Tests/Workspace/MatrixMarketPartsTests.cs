using System.IO.Compression;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>
/// Which upload is the matrix and which are its sidecars, on the demo triple (catalog/demo/mtx, written from the seeded
/// demo counts) and on small hand-made files; a missing, extra or mismatched file is named.
/// </summary>
public sealed class MatrixMarketPartsTests : IDisposable
{
    private readonly string _dir = Directory.CreateDirectory(Path.Combine(Path.GetTempPath(), "exprmodel-mtx-parts-" + Guid.NewGuid().ToString("N")))
        .FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    internal static string DemoMtx(string file)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var f = Path.Combine(d.FullName, "catalog", "demo", "mtx", file);
            if (File.Exists(f)) return f;
        }
        throw new FileNotFoundException(file);
    }

    private ReceivedFile Put(string name, byte[] bytes)
    {
        var path = Path.Combine(Directory.CreateDirectory(Path.Combine(_dir, Guid.NewGuid().ToString("N"))).FullName, Path.GetFileName(name));
        File.WriteAllBytes(path, bytes);
        return new ReceivedFile(name, path);
    }

    private ReceivedFile Put(string name, string text) => Put(name, System.Text.Encoding.UTF8.GetBytes(text));

    private static readonly UploadLimits Limits = new(10_000_000, 100_000);

    [Fact]
    public void The_demo_triple_is_sorted_by_name_in_any_order()
    {
        var files = new[] { "barcodes.tsv", "matrix.mtx", "genes.tsv" }.Select(f => Put(f, File.ReadAllBytes(DemoMtx(f)))).ToList();
        var parts = MatrixMarketParts.Identify(files, Limits)!;
        Assert.Equal("matrix.mtx", parts.Matrix.Name);
        Assert.Equal("genes.tsv", parts.Genes.Name);
        Assert.Equal("barcodes.tsv", parts.Cells.Name);
        // The demo README: 240 cells (48 per group, five groups); every gene row of counts.csv.
        Assert.Equal(240, parts.Columns);
        Assert.Equal(File.ReadAllLines(DemoMtx("genes.tsv")).Length, parts.Rows);
        Assert.Contains("× 240 cells", parts.Summary);
    }

    [Fact]
    public void Sidecars_with_uninformative_names_are_told_apart_by_their_line_counts_and_gzip_is_opened()
    {
        var matrix = Put("m.txt", "%%MatrixMarket matrix coordinate integer general\n% comment\n3 2 2\n1 1 5\n3 2 7\n");
        var rows = Put("a.txt", Gzip("Scn1a\nKcnc1\nHcn1\n"));
        var columns = Put("b.txt", "c1\nc2\n\n");
        var parts = MatrixMarketParts.Identify([columns, matrix, rows], Limits)!;
        Assert.Equal(("m.txt", "a.txt", "b.txt"), (parts.Matrix.Name, parts.Genes.Name, parts.Cells.Name));
        Assert.Equal((3, 2, 2), ((int)parts.Rows, (int)parts.Columns, (int)parts.Entries));
    }

    [Fact]
    public void A_sidecar_that_does_not_fit_the_matrix_is_named_with_both_counts()
    {
        var matrix = Put("matrix.mtx", "%%MatrixMarket matrix coordinate real general\n2000 3 1\n1 1 1.5\n");
        var genes = Put("genes.tsv", string.Concat(Enumerable.Range(1, 1998).Select(i => $"G{i}\n")));
        var cells = Put("barcodes.tsv", "c1\nc2\nc3\n");
        var e = Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([matrix, genes, cells], Limits));
        Assert.Equal("matrix.mtx has 2,000 rows but genes.tsv lists 1,998 genes.", e.Message);
        var fewCells = Put("cells.tsv", "c1\nc2\n");
        var genesOk = Put("features.tsv", string.Concat(Enumerable.Range(1, 2000).Select(i => $"G{i}\n")));
        e = Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([matrix, genesOk, fewCells], Limits));
        Assert.Equal("matrix.mtx has 3 columns but cells.tsv lists 2 cells.", e.Message);
    }

    [Fact]
    public void Missing_extra_and_doubled_files_are_named()
    {
        var matrix = Put("matrix.mtx", "%%MatrixMarket matrix coordinate integer general\n3 2 1\n1 1 5\n");
        var genes = Put("genes.tsv", "A\nB\nC\n");
        var cells = Put("barcodes.tsv", "c1\nc2\n");
        Assert.Contains("matrix.mtx came without its cells file",
            Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([matrix, genes], Limits)).Message);
        Assert.Contains("matrix.mtx came without its genes file: add the features.tsv or genes.tsv that names its 3 rows",
            Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([matrix, cells], Limits)).Message);
        var extra = Put("notes.txt", "one\ntwo\nthree\nfour\n");
        Assert.Contains("notes.txt: 4 lines, which match neither the 3 rows (genes) nor the 2 columns (cells) of matrix.mtx",
            Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([matrix, genes, cells, extra], Limits)).Message);
        var second = Put("other.mtx", "%%MatrixMarket matrix coordinate integer general\n1 1 1\n1 1 1\n");
        Assert.Contains("matrix.mtx, other.mtx: 2 Matrix Market matrices",
            Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([matrix, second, genes, cells], Limits)).Message);
        Assert.Contains("genes.tsv, barcodes.tsv: 2 files but none is a Matrix Market matrix",
            Assert.Throws<UserInputException>(() => MatrixMarketParts.Identify([genes, cells], Limits)).Message);
        Assert.Null(MatrixMarketParts.Identify([genes], Limits)); // one file that is no matrix: an ordinary table
    }

    [Fact]
    public void A_sidecar_bomb_stops_at_the_inflation_limit()
    {
        var matrix = Put("matrix.mtx", "%%MatrixMarket matrix coordinate integer general\n3 2 1\n1 1 5\n");
        var bomb = Put("genes.tsv.gz", Gzip(new string('A', 3_000_000)));
        var e = Assert.Throws<UploadTooLargeException>(() => MatrixMarketParts.Identify([matrix, bomb], new UploadLimits(1_000_000, 100_000)));
        Assert.Contains("genes.tsv.gz: inflates past", e.Message);
    }

    internal static byte[] Gzip(string text)
    {
        using var buffer = new MemoryStream();
        using (var gz = new GZipStream(buffer, CompressionLevel.SmallestSize)) gz.Write(System.Text.Encoding.UTF8.GetBytes(text));
        return buffer.ToArray();
    }
}
