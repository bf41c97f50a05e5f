using System.Text.Json.Nodes;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Tests.Expression;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests.Mapping;

public sealed class DatasetReferencesTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private static string Demo(string file) => Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", file);

    private static (ExpressionDataset Data, PerCellShrinkage Shrinkage, DatasetReferences References) DemoReferences()
    {
        var data = ExpressionDataset.Read(TestCatalog.Catalog.ForMapping(), Demo("counts.csv"), new ExpressionReadOptions(), Demo("metadata.csv"), "group");
        var shrinkage = data.Shrink(data.Map());
        var references = DatasetReferences.Compute(data, shrinkage.Report, new DensityRule(), "shrink=group") with { Shrinkage = shrinkage.Priors };
        return (data, shrinkage, references);
    }

    [Fact]
    public void ShrinkagePriorsAndReferencesReadBackExactly()
    {
        var (data, shrinkage, references) = DemoReferences();
        var path = _files.Text("refs.json", references.ToJson());
        var read = DatasetReferences.Read(path);
        Assert.Equal(references.Entries, read.Entries);
        var written = shrinkage.Priors.All.SelectMany(g => g.Priors.Select(p => (g.Gene, p.Set, p.Prior))).ToList();
        // Every mapped gene has a prior for each of the demo's five groups (no cell is without a group).
        Assert.Equal(data.Map().Genes.Count * 5, written.Count);
        foreach (var (gene, set, prior) in written)
            Assert.Equal(prior, read.Shrinkage!.Of(gene, set)); // record equality: the doubles are bit-identical
        Assert.Contains(written, w => w.Prior.RateVariance > 0);
        Assert.Null(DatasetReferences.Read(_files.Text("plain.json", (references with { Shrinkage = null }).ToJson())).Shrinkage);
    }

    [Fact]
    public void AMalformedPriorIsNamedByFileAndField()
    {
        var (_, shrinkage, references) = DemoReferences();
        var o = JsonNode.Parse(references.ToJson())!.AsObject();
        var (gene, priors) = shrinkage.Priors.All.First();
        string set = priors.First().Set;
        o["shrinkage"]!["priors"]![gene]![set]!["rateVariance"] = -1;
        var e = Assert.Throws<FormatException>(() => DatasetReferences.Read(_files.Text("bad.json", o.ToJsonString())));
        Assert.Equal($"bad.json: field 'shrinkage.priors.{gene}.{set}.rateVariance' is not a number >= 0.", e.Message);
    }

    [Fact]
    public void AMismatchNamesTheSettingsThatDiffer()
    {
        var (data, _, references) = DemoReferences();
        var table = Demo("counts.csv");
        Assert.Null(references.Mismatch(table, data.Table.CellIds.Count, "shrink=group"));
        Assert.Equal("made with settings 'shrink=group', this run's are 'shrink=none' (they differ in: shrink=group there, shrink=none here)",
            references.Mismatch(table, data.Table.CellIds.Count, "shrink=none"));
    }
}
