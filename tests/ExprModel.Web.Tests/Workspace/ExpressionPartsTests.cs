using ExprModel.Data.Catalog;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>
/// A Matrix Market upload read end to end through <see cref="ExpressionSession"/>: the demo triple as parts and in
/// archives reads to the same cells and genes as the demo's counts.csv, and the reader's messages name the user's files.
/// </summary>
public sealed class ExpressionPartsTests : IDisposable
{
    private readonly string _dir = Directory.CreateDirectory(Path.Combine(Path.GetTempPath(), "exprmodel-parts-" + Guid.NewGuid().ToString("N"))).FullName;
    private readonly ChannelCatalog _catalog;

    public ExpressionPartsTests() => _catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private static UploadedFile Demo(string file, string? name = null) => new(name ?? file, File.ReadAllBytes(MatrixMarketPartsTests.DemoMtx(file)));

    private static string Counts => Path.Combine(Path.GetDirectoryName(MatrixMarketPartsTests.DemoMtx("matrix.mtx"))!, "..", "counts.csv");

    private static readonly ReadChoices Detect = new(null, null, null);

    [Fact]
    public void The_demo_triple_reads_like_the_demo_csv_as_parts_in_a_zip_and_in_a_tar_gz()
    {
        var csv = ExpressionSession.Read(_catalog, File.ReadAllBytes(Counts), "counts.csv", null, null, Detect).Dataset.Table;
        UploadedFile[] parts = [Demo("genes.tsv", "GSM1_features.tsv"), Demo("matrix.mtx", "GSM1_matrix.mtx"), Demo("barcodes.tsv", "GSM1_barcodes.tsv")];
        var zip = new UploadedFile("run.zip", UploadArchiveTests.Zip([.. parts.Select(p => ("run/" + p.Name, p.Bytes))]));
        var tar = new UploadedFile("run.tar.gz", UploadArchiveTests.TarGz([.. parts.Select(p => (p.Name, p.Bytes))]));
        foreach (var upload in new[] { parts, [zip], [tar] })
        {
            var table = ExpressionSession.Read(_catalog, upload, null, null, Detect).Dataset.Table;
            Assert.Equal(csv.CellIds, table.CellIds);
            Assert.Equal(csv.Genes.Keys.Order(), table.Genes.Keys.Order());
            foreach (var (gene, values) in csv.Genes) Assert.Equal(values, table.Genes[gene]);
            Assert.Equal(csv.Unit, table.Unit);
            Assert.Contains("matrix.mtx", table.Source);
        }
    }

    [Fact]
    public void The_readers_messages_name_the_files_as_sent()
    {
        // A repeated cell id in the cells file: the reader's message names the user's file, not the folder's copy.
        var cells = File.ReadAllLines(MatrixMarketPartsTests.DemoMtx("barcodes.tsv"));
        cells[5] = cells[4];
        var bad = new UploadedFile("GSM1_barcodes.tsv", System.Text.Encoding.UTF8.GetBytes(string.Join('\n', cells) + "\n"));
        var e = Assert.Throws<UserInputException>(() =>
            ExpressionSession.Read(_catalog, [Demo("matrix.mtx"), Demo("genes.tsv"), bad], null, null, Detect));
        Assert.StartsWith("GSM1_barcodes.tsv: line 6", e.Message);
        Assert.Contains(cells[4], e.Message);
    }

    [Fact]
    public void A_lone_matrix_asks_for_its_sidecars_and_a_table_in_a_zip_is_read()
    {
        var e = Assert.Throws<UserInputException>(() => ExpressionSession.Read(_catalog, [Demo("matrix.mtx")], null, null, Detect));
        Assert.Contains("matrix.mtx came without its genes file", e.Message);
        var zip = new UploadedFile("counts.zip", UploadArchiveTests.Zip(("counts.csv", File.ReadAllBytes(Counts))));
        Assert.Equal(240, ExpressionSession.Read(_catalog, [zip], null, null, Detect).Dataset.Table.CellIds.Count);
    }
}
