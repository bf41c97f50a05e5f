using System.Text.Json.Nodes;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Tests.Expression;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests.Mapping;

public sealed class PerCellShrinkageTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private static MappingCatalog Catalog => TestCatalog.Catalog.ForMapping();
    private static string Demo(string file) => Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", file);

    private static readonly Lazy<(ExpressionDataset Data, MappingReport Report)> DemoData = new(() =>
    {
        var data = ExpressionDataset.Read(Catalog, Demo("counts.csv"), new ExpressionReadOptions(), Demo("metadata.csv"), "group");
        return (data, data.Map());
    });

    [Fact]
    public void AZeroCountInAGroupThatExpressesTheGeneNoLongerSilencesItsChannelAndSaysSo()
    {
        var (data, report) = DemoData.Value;
        var raw = report.EntryExpression();
        // A demo cell whose channel entry reads zero while its group's mean is well above zero (at least 10 CPM).
        var (cell, entry) = data.Groups!.Members.SelectMany(g => g.Value.SelectMany(i => raw
                .Where(e => e.Value[i] == 0 && g.Value.Average(j => e.Value[j]) >= 10)
                .Select(e => (Cell: data.Table.CellIds[i], Entry: e.Key))))
            .First();
        var target = ModelTarget.ForCell(cell);
        var rule = new DensityRule();

        var plain = data.Build(report, rule, target);
        Assert.Equal(0, plain.Densities.Single(d => d.EntryId == entry).DensityMsPerCm2);

        var shrinkage = data.Shrink(report);
        Assert.True(shrinkage.Applies);
        var shrunk = data.Build(report, rule, target, shrinkage);
        var density = shrunk.Densities.Single(d => d.EntryId == entry);
        Assert.True(density.DensityMsPerCm2 > 0, $"{cell} {entry}: {density.DensityMsPerCm2}");
        Assert.Contains(shrunk.Warnings, w => w.StartsWith(entry + ":") && w.Contains("read 0 counts in cell " + cell));
        Assert.Contains(shrunk.Document.Channels, c => c.Entry == entry);

        // The derivation shows both values for every density, and the note.
        var estimate = shrunk.Document.Derivation!["expressionEstimate"]!.AsObject();
        Assert.Contains("gamma-Poisson", estimate["method"]!.GetValue<string>());
        var row = estimate["densities"]!.AsArray().Single(d => d!["entry"]!.GetValue<string>() == entry)!;
        Assert.Equal(0, row["rawExpression"]!.GetValue<double>());
        Assert.True(row["shrunkExpression"]!.GetValue<double>() > 0);
        Assert.True(row["fromZeroCounts"]!.GetValue<bool>());
        Assert.Contains(shrunk.Document.Derivation!["warnings"]!.AsArray(), w => w!.GetValue<string>().StartsWith(entry + ":"));
        // The model file with its derivation still reads back.
        Assert.Equal(shrunk.Document.Channels.Count, ExprModel.Core.Models.ModelDocument.Parse(shrunk.Document.ToJson(), "shrunk").Channels.Count);
    }

    [Fact]
    public void GroupModelsAreBuiltFromRawValuesWithOrWithoutShrinkage()
    {
        var (data, report) = DemoData.Value;
        var target = ModelTarget.ForGroup("T2-adapting");
        var plain = data.Build(report, new DensityRule(), target);
        var withShrinkage = data.Build(report, new DensityRule(), target, data.Shrink(report));
        Assert.Equal(plain.Document.ToJson(), withShrinkage.Document.ToJson());
    }

    [Fact]
    public void ShrunkValuesStayWithinTheCellsOwnAndItsGroupsLevel()
    {
        // The posterior mean lies between the cell's raw CPM and the group's pooled mean (a weighted average of the two).
        var (data, report) = DemoData.Value;
        var shrunk = data.Shrink(report).Report;
        foreach (var (group, members) in data.Groups!.Members)
            foreach (var (g, s) in report.Genes.Zip(shrunk.Genes))
            {
                var counts = data.Table.Genes[g.TableId];
                double pooled = members.Sum(i => counts[i]) / members.Sum(i => data.Table.LibrarySizes[i]) * 1e6;
                foreach (int i in members)
                {
                    double lo = Math.Min(g.ExpressionByCell[i], pooled) - 1e-9, hi = Math.Max(g.ExpressionByCell[i], pooled) + 1e-9;
                    Assert.InRange(s.ExpressionByCell[i], lo, hi);
                }
            }
    }

    [Fact]
    public void APartOfTheTableShrunkWithTheWholeTablesPriorsBuildsTheModelsTheWholeTableBuilds()
    {
        var (data, report) = DemoData.Value;
        var whole = data.Shrink(report);
        var rule = new DensityRule();
        var references = DatasetReferences.Compute(data, whole.Report, rule, "settings");
        // Cells 40..99: the end of one group, a whole group and the start of a third, read by range with the whole table's unit.
        var part = ExpressionDataset.Read(Catalog, Demo("counts.csv"), new ExpressionReadOptions { Cells = new CellRange(40, 60), Unit = data.Table.Unit },
            Demo("metadata.csv"), "group");
        Assert.Equal(60, part.Table.CellIds.Count);
        Assert.Equal(3, part.Groups!.Members.Count);
        var partReport = part.Map();
        var stored = part.Shrink(partReport, whole.Priors);
        Assert.Equal(whole.Note, stored.Note);
        var partRule = rule with { FixedReferences = references.Entries };
        int differs = 0;
        var own = part.Shrink(partReport); // priors fitted over the part alone
        foreach (var cell in part.Table.CellIds)
        {
            var expected = data.Build(report, rule, ModelTarget.ForCell(cell), whole);
            var built = part.Build(partReport, partRule, ModelTarget.ForCell(cell), stored);
            Assert.Equal(Comparable(expected), Comparable(built)); // derivation, expressionEstimate included
            Assert.Equal(expected.Warnings, built.Warnings);
            if (Comparable(part.Build(partReport, partRule, ModelTarget.ForCell(cell), own)) != Comparable(expected)) differs++;
        }
        // The part's own priors (two of its three groups are cut) give other models: the stored priors are what make them equal.
        Assert.True(differs > 0);
    }

    /// <summary>The model file without the derivation's unit note, which says how the unit was decided: detected over every
    /// cell by the whole read, stated (from the references) for the part; the unit itself is compared.</summary>
    private static string Comparable(BuiltModel built)
    {
        var o = JsonNode.Parse(built.Document.ToJson())!.AsObject();
        Assert.NotNull(o["derivation"]!.AsObject()["unitNote"]);
        o["derivation"]!.AsObject().Remove("unitNote");
        return o.ToJsonString();
    }

    [Fact]
    public void StoredPriorsMissingAGeneOrAGroupAreNamed()
    {
        var (data, report) = DemoData.Value;
        var priors = new ShrinkagePriors();
        var gene = report.Genes[0].TableId;
        priors.Add(gene, "group T1-fast", new ExprModel.Core.Expression.Shrinkage.GammaPoissonPrior(10, 1, 48));
        var e = Assert.Throws<ArgumentException>(() => data.Shrink(report, priors));
        Assert.Contains($"no shrinkage prior for gene {gene} over group T2-adapting (stored: group T1-fast)", e.Message);
        var other = new ShrinkagePriors();
        other.Add("NotAGene", "group T1-fast", new ExprModel.Core.Expression.Shrinkage.GammaPoissonPrior(10, 1, 48));
        Assert.Contains($"no shrinkage prior for gene {gene}", Assert.Throws<ArgumentException>(() => data.Shrink(report, other)).Message);
    }

    [Fact]
    public void TablesWithoutRawCountsAreNotShrunkAndSaySo()
    {
        var tpm = _files.Text("tpm.csv", "gene,c1,c2,c3\nScn1a,10.5,12.25,0.5\nKcnb1,5.5,0,2.75\n");
        var data = ExpressionDataset.Read(Catalog, tpm, new ExpressionReadOptions { Unit = ExpressionUnit.Tpm });
        var report = data.Map();
        var s = data.Shrink(report);
        Assert.False(s.Applies);
        Assert.Contains("needs raw counts", s.Note);
        Assert.Equal(data.Build(report, new DensityRule(), ModelTarget.ForCell("c2")).Document.ToJson(),
            data.Build(report, new DensityRule(), ModelTarget.ForCell("c2"), s).Document.ToJson());
    }
}
