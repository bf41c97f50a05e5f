using ExprModel.Core.Expression;
using ExprModel.Data.Demo;

namespace ExprModel.Data.Tests.Demo;

/// <summary>
/// The committed Matrix Market demo triple (catalog/demo/mtx/) is exactly what the generator makes from the seeded
/// counts, and reads back to the same counts as counts.csv. Set EXPRMODEL_WRITE_DEMO=1 to rewrite it.
/// </summary>
public sealed class DemoMatrixMarketTests
{
    private static string DemoDir()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "ExprModel.sln"))) return Path.Combine(dir.FullName, "catalog", "demo");
        throw new InvalidOperationException("ExprModel.sln not found above " + AppContext.BaseDirectory);
    }

    private static string MtxDir => Path.Combine(DemoDir(), DemoMatrixMarket.FolderName);

    [Fact]
    public void Committed_triple_is_exactly_what_the_generator_makes()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_WRITE_DEMO") == "1") DemoMatrixMarket.WriteTo(MtxDir);
        var fresh = DemoMatrixMarket.Generate();
        Assert.Equal(fresh.Matrix, File.ReadAllText(Path.Combine(MtxDir, DemoMatrixMarket.MatrixFileName)));
        Assert.Equal(fresh.Genes, File.ReadAllText(Path.Combine(MtxDir, DemoMatrixMarket.GenesFileName)));
        Assert.Equal(fresh.Cells, File.ReadAllText(Path.Combine(MtxDir, DemoMatrixMarket.CellsFileName)));
    }

    [Fact]
    public void Size_line_counts_the_non_zero_cells_of_counts_csv()
    {
        // Counted here from the committed CSV text itself, not through any reader of the project.
        var lines = File.ReadAllLines(Path.Combine(DemoDir(), DemoDataGenerator.CountsFileName));
        int cells = lines[0].Split(',').Length - 1;
        long nonZero = lines.Skip(1).Sum(l => l.Split(',').Skip(1).Count(v => v != "0"));
        var sizeLine = File.ReadLines(Path.Combine(MtxDir, DemoMatrixMarket.MatrixFileName)).First(l => !l.StartsWith('%'));
        Assert.Equal($"{lines.Length - 1} {cells} {nonZero}", sizeLine);
    }

    [Fact]
    public void Reads_back_to_the_same_counts_as_the_csv()
    {
        // The duplicated row is refused by both readers unless left out (the demo's deliberate awkward row).
        var options = new ExpressionReadOptions { KeepGene = g => g != DemoDataGenerator.DuplicatedRow };
        var csv = ExpressionReader.Read(Path.Combine(DemoDir(), DemoDataGenerator.CountsFileName), options);
        var mtx = ExpressionReader.Read(MtxDir, options);
        Assert.True(csv.Genes.Count > 500);
        Assert.Equal(csv.CellIds, mtx.CellIds);
        Assert.Equal(csv.Unit, mtx.Unit);
        Assert.Equal(csv.Genes.Keys.Order(StringComparer.Ordinal), mtx.Genes.Keys.Order(StringComparer.Ordinal));
        foreach (var (gene, values) in csv.Genes) Assert.Equal(values, mtx.Genes[gene]);
        Assert.Equal(csv.LibrarySizes, mtx.LibrarySizes);
    }
}
