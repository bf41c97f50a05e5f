using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Tests.Expression;

namespace ExprModel.Core.Tests.Mapping;

/// <summary>The shared read / group / map / build orchestration, on small hand-written tables and the real catalog.</summary>
public sealed class ExpressionDatasetTests : IDisposable
{
    private readonly TempFiles _files = new();
    private static MappingCatalog Catalog => TestCatalog.Catalog.ForMapping();

    // Four cells; Scn1a and Kcnb1 are channel genes the catalog links, Actb is not a channel gene.
    private const string Counts = "gene,c1,c2,c3,c4\nScn1a,10,12,30,28\nKcnb1,5,6,2,1\nActb,900,880,950,910\n";

    public void Dispose() => _files.Dispose();

    [Fact]
    public void KeepsOnlyTheGenesTheCatalogKnowsAndOffersEveryCellWithoutMetadata()
    {
        var data = ExpressionDataset.Read(Catalog, _files.Text("pilot.csv", Counts), new ExpressionReadOptions());
        Assert.Contains("Scn1a", data.Table.Genes.Keys);
        Assert.DoesNotContain("Actb", data.Table.Genes.Keys);
        Assert.Equal(3, data.Table.TotalGeneCount); // Actb still counts towards library size
        Assert.Null(data.Groups);
        Assert.Equal(["c1", "c2", "c3", "c4"], data.Targets.Select(t => t.CellId));
        Assert.Empty(data.Notes);
    }

    [Fact]
    public void GroupsCellsByTheMetadataColumnAndNotesTheUnlabelledOnes()
    {
        var meta = _files.Text("meta.csv", "cell_id,type\nc1,A\nc2,A\nc3,B\n");
        var data = ExpressionDataset.Read(Catalog, _files.Text("pilot.csv", Counts), new ExpressionReadOptions(), meta, "type");
        Assert.Equal(["A", "B"], data.Groups!.Members.Keys);
        Assert.Equal([0, 1], data.Groups.Members["A"]);
        Assert.Equal(["A", "B"], data.Targets.Select(t => t.Group));
        Assert.Equal(4, data.CellTargets.Count);
        Assert.Equal(["1 cell(s) of the table have no 'type' label in meta.csv."], data.Notes);
    }

    [Fact]
    public void MapsAndBuildsAGroupModelThatRecordsItsSource()
    {
        var meta = _files.Text("meta.csv", "cell_id,type\nc1,A\nc2,A\nc3,B\nc4,B\n");
        var data = ExpressionDataset.Read(Catalog, _files.Text("upload-copy.csv", Counts), new ExpressionReadOptions(), meta, "type", sourceName: "pilot.csv");
        Assert.Equal("pilot.csv", data.Table.Source);
        var report = data.Map();
        Assert.Contains(report.Genes, g => g.Symbol == "Scn1a");
        var built = data.Build(report, new DensityRule(), ModelTarget.ForGroup("B"));
        Assert.Contains("pilot.csv", built.Document.Name);
        Assert.Equal("pilot.csv", built.Document.Derivation!["source"]!.GetValue<string>());
        Assert.Contains(built.Densities, d => d.EntryId == "traub-na");
    }

    [Fact]
    public void AMissingGroupColumnNamesTheFileTheColumnAndTheColumnsThere()
    {
        var meta = _files.Text("meta.csv", "cell_id,type\nc1,A\n");
        var e = Assert.Throws<ExpressionFormatException>(() =>
            ExpressionDataset.Read(Catalog, _files.Text("pilot.csv", Counts), new ExpressionReadOptions(), meta, "cluster"));
        Assert.Contains("meta.csv", e.Message);
        Assert.Contains("'cluster'", e.Message);
        Assert.Contains("type", e.Message);
    }

    [Fact]
    public void MetadataWithoutAGroupColumnIsRefused() =>
        Assert.Throws<ArgumentException>(() =>
            ExpressionDataset.Read(Catalog, _files.Text("pilot.csv", Counts), new ExpressionReadOptions(), _files.Text("meta.csv", "cell_id,type\nc1,A\n")));

    [Fact]
    public void ABadTableIsReportedWithFileAndLine()
    {
        var e = Assert.Throws<ExpressionFormatException>(() =>
            ExpressionDataset.Read(Catalog, _files.Text("ragged.csv", "gene,c1,c2,c3\nScn1a,1,2,3\nKcnb1,4,5\n"), new ExpressionReadOptions()));
        Assert.Contains("ragged.csv", e.Message);
        Assert.Contains("line 3", e.Message);
    }

    [Fact]
    public void AnUnknownGroupIsRefusedNamingTheGroupsThereAre()
    {
        var meta = _files.Text("meta.csv", "cell_id,type\nc1,A\nc2,B\n");
        var data = ExpressionDataset.Read(Catalog, _files.Text("pilot.csv", Counts), new ExpressionReadOptions(), meta, "type");
        var e = Assert.Throws<ArgumentException>(() => data.Build(data.Map(), new DensityRule(), ModelTarget.ForGroup("C")));
        Assert.Contains("'C'", e.Message);
        Assert.Contains("A, B", e.Message);
    }
}
