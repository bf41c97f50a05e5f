using System.Globalization;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;
using ExprModel.Data.Demo;

namespace ExprModel.Data.Tests.Demo;

/// <summary>
/// The committed demo AnnData file (catalog/demo/h5ad/demo.h5ad) is exactly what the generator writes from the seeded
/// counts; its counts layer reads back to counts.csv's values, and X to ln(1 + 10,000 x count / library size) computed
/// here from counts.csv's text. Set EXPRMODEL_WRITE_DEMO=1 to rewrite it.
/// </summary>
public sealed class DemoAnnDataTests
{
    private static string DemoDir()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "ExprModel.sln"))) return Path.Combine(dir.FullName, "catalog", "demo");
        throw new InvalidOperationException("ExprModel.sln not found above " + AppContext.BaseDirectory);
    }

    private static string Committed => Path.Combine(DemoDir(), DemoAnnData.FolderName, DemoAnnData.FileName);

    /// <summary>The duplicated row is refused by the readers unless left out (the demo's deliberate awkward row).</summary>
    private static ExpressionReadOptions Options(string? matrix = null, string? unit = null) =>
        ReadOptionsParser.Parse(null, unit, matrix: matrix) with { KeepGene = g => g != DemoDataGenerator.DuplicatedRow };

    [Fact]
    public void Committed_file_is_exactly_what_the_generator_writes()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_WRITE_DEMO") == "1") DemoAnnData.WriteTo(Path.GetDirectoryName(Committed)!);
        var dir = Directory.CreateTempSubdirectory("exprmodel-demo-h5ad-").FullName;
        try
        {
            var fresh = DemoAnnData.WriteTo(dir);
            Assert.Equal(File.ReadAllBytes(fresh), File.ReadAllBytes(Committed));
        }
        finally { Directory.Delete(dir, recursive: true); }
        Assert.True(new FileInfo(Committed).Length < 1_000_000, "the demo file should stay small enough to commit and to upload in the tests");
    }

    [Fact]
    public void The_counts_layer_reads_back_to_the_counts_of_the_csv()
    {
        var csv = ExpressionReader.Read(Path.Combine(DemoDir(), DemoDataGenerator.CountsFileName), Options());
        var h5ad = ExpressionReader.Read(Committed, Options(matrix: "layer:counts"));
        Assert.Equal(csv.CellIds, h5ad.CellIds);
        Assert.Equal(csv.Unit, h5ad.Unit);
        Assert.Equal(csv.Genes.Keys.Order(StringComparer.Ordinal), h5ad.Genes.Keys.Order(StringComparer.Ordinal));
        foreach (var (gene, values) in csv.Genes) Assert.Equal(values, h5ad.Genes[gene]);
        Assert.Equal(csv.LibrarySizes, h5ad.LibrarySizes);
    }

    [Fact]
    public void X_holds_log_normalised_values_and_the_reader_points_to_the_counts_layer()
    {
        // Computed here from counts.csv's text: ln(1 + 1e4 x count / library size), library size over every row.
        var lines = File.ReadAllLines(Path.Combine(DemoDir(), DemoDataGenerator.CountsFileName));
        var rows = lines.Skip(1).Select(l => l.Split(',')).ToArray();
        int cells = lines[0].Split(',').Length - 1;
        var library = Enumerable.Range(1, cells).Select(c => rows.Sum(r => double.Parse(r[c], CultureInfo.InvariantCulture))).ToArray();
        var kcnc1 = rows.Single(r => r[0] == "Kcnc1");
        // Stated as log-transformed, the reader undoes ln(1 + x): 1e4 x count / library size back (float32 values).
        var undone = ExpressionReader.Read(Committed, Options(unit: "log-transformed"));
        for (int c = 0; c < cells; c++)
        {
            double expected = 1e4 * double.Parse(kcnc1[c + 1], CultureInfo.InvariantCulture) / library[c];
            Assert.Equal(expected, undone.Genes["Kcnc1"][c], 1e-5 * Math.Max(1, expected));
        }

        var refusal = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(Committed, Options()));
        Assert.StartsWith("demo.h5ad: dataset /X: values look log-transformed", refusal.Message);
        Assert.Contains("layers/counts holds whole numbers: use --matrix layer:counts", refusal.Message);
    }

    [Fact]
    public void The_overview_lists_X_and_the_counts_layer_with_the_readers_own_hint()
    {
        var overview = AnnDataReader.Describe(Committed);
        Assert.Equal((240, 558), (overview.Cells, overview.Genes));
        Assert.Equal(["X", "layer:counts"], overview.Matrices.Select(m => m.Choice.Spelling));
        Assert.All(overview.Matrices, m => Assert.Equal("csr_matrix", m.Layout));
        Assert.All(overview.Matrices, m => Assert.Equal([240, 558], m.Shape!));
        Assert.False(overview.Matrices[0].AllWhole);
        Assert.True(overview.Matrices[1].LooksLikeCounts);
        Assert.Equal("layer:counts", overview.Suggested?.Spelling);
        // The demo's X has fewer stored values than the overview looks at, so its hint is the reader's refusal word for word.
        var refusal = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(Committed, Options()));
        Assert.Equal(refusal.Message, overview.Hint);
    }
}
