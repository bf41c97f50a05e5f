using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Data.Demo;

namespace ExprModel.Data.Tests.Demo;

/// <summary>
/// The committed demo files must be exactly what the seeded generator makes, and must load with the expected groups.
/// Set EXPRMODEL_WRITE_DEMO=1 to rewrite catalog/demo/ from the generator (then commit the result).
/// </summary>
public sealed class DemoDataTests
{
    private static string RepoRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
            if (File.Exists(Path.Combine(dir.FullName, "ExprModel.sln"))) return dir.FullName;
        throw new InvalidOperationException("ExprModel.sln not found above " + AppContext.BaseDirectory);
    }

    private static string DemoDir => Path.Combine(RepoRoot(), "catalog", "demo");
    private static string CountsPath => Path.Combine(DemoDir, DemoDataGenerator.CountsFileName);
    private static string MetadataPath => Path.Combine(DemoDir, DemoDataGenerator.MetadataFileName);

    private static readonly HashSet<string> ChannelGenes =
    [
        "Scn1a", "Scn2a", "Scn3a", "Scn8a", "Scn9a", "Kcna1", "Kcna2", "Kcnb1", "Kcnc1", "Kcnc2", "Kcnd2", "Kcnd3",
        "Kcnq2", "Kcnq3", "Kcnq5", "Kcnj2", "Hcn1", "Hcn2", "Cacna1a", "Cacna1b", "Cacna1c", "Cacna1e", "Cacna1g",
        "Cacna1h", "Cacna1i", "Kcnn1", "Kcnn2", "Kcnn3", "Kcnma1", "Kcnk2", "Kcnk9", "Nalcn",
    ];

    [Fact]
    public void CommittedFiles_AreExactlyWhatTheSeededGeneratorMakes()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_WRITE_DEMO") == "1") DemoDataGenerator.WriteTo(DemoDir);
        var fresh = DemoDataGenerator.Generate(DemoDataGenerator.DefaultSeed);
        Assert.Equal(System.Text.Encoding.UTF8.GetBytes(fresh.CountsCsv), File.ReadAllBytes(CountsPath));
        Assert.Equal(System.Text.Encoding.UTF8.GetBytes(fresh.MetadataCsv), File.ReadAllBytes(MetadataPath));
        // The size budget for shipped demo data.
        Assert.True(new FileInfo(CountsPath).Length + new FileInfo(MetadataPath).Length < 2_000_000);
    }

    [Fact]
    public void AnotherSeed_GivesDifferentCounts() =>
        Assert.NotEqual(DemoDataGenerator.Generate(1).CountsCsv, DemoDataGenerator.Generate(2).CountsCsv);

    [Fact]
    public void Loads_WithExpectedGroupsCountsAndAmbiguousRowsReported()
    {
        var table = ExpressionReader.Read(CountsPath, new() { KeepGene = ChannelGenes.Contains });
        var meta = CellMetadataReader.Read(MetadataPath);

        Assert.Equal(ExpressionUnit.Counts, table.Unit);
        Assert.Equal(TableOrientation.GenesAsRows, table.Orientation);
        Assert.Equal(DemoDataGenerator.Groups.Select(g => g.Name), meta.Groups("group"));
        Assert.Equal(table.CellIds, meta.CellIds);
        Assert.Equal(DemoDataGenerator.Groups.Count * DemoDataGenerator.CellsPerGroup, table.CellIds.Count);
        Assert.True(table.TotalGeneCount > 500, "plenty of non-channel genes");
        // Kcnma1 is written under an alias, so a symbol filter does not find it; the duplicated row is noted.
        Assert.DoesNotContain("Kcnma1", table.Genes.Keys);
        Assert.Equal(ChannelGenes.Count - 1, table.Genes.Count);
        Assert.Contains(table.Notes, n => n.Contains($"'{DemoDataGenerator.DuplicatedRow}'"));

        // Dropouts and library-size variation are present.
        Assert.Contains(table.Genes["Scn1a"], v => v == 0);
        Assert.True(table.LibrarySizes.Max() > 2 * table.LibrarySizes.Min());

        // Recorded read-outs for some cells, with units from the headers.
        var rest = meta.RecordedColumn("resting potential")!;
        Assert.Equal("mV", rest.Unit);
        int recorded = rest.Values.Count(v => v is not null);
        Assert.InRange(recorded, table.CellIds.Count / 5, table.CellIds.Count / 2);
        Assert.Equal(["mV", "MOhm", "pA", "Hz"], meta.Recorded.Select(c => c.Unit));
    }

    [Fact]
    public void Groups_DifferInTheChannelGenesTheirFiringDependsOn()
    {
        var table = ExpressionReader.Read(CountsPath, new() { KeepGene = ChannelGenes.Contains });
        var meta = CellMetadataReader.Read(MetadataPath);
        double Mean(string gene, string group)
        {
            var cpm = table.Normalised(gene);
            var cells = meta.CellsIn("group", group).Select(c => table.CellIds.ToList().IndexOf(c)).ToList();
            return cells.Average(i => cpm[i]);
        }
        // Design of the demo (issue 3, section 5): fast cells carry Kv3, adapting cells Kv7 and SK, bursting cells
        // T-type calcium, low-threshold cells Scn8a with little Kv1, pacing cells HCN. Each marker must be at least
        // twice as high in its group as in every other group.
        (string Group, string[] Genes)[] markers =
        [
            ("T1-fast", ["Kcnc1", "Kcnc2"]),
            ("T2-adapting", ["Kcnq5", "Kcnn2"]),
            ("T3-bursting", ["Cacna1g", "Cacna1h"]),
            ("T4-low-threshold", ["Scn8a"]),
            ("T5-pacing", ["Hcn2"]),
        ];
        foreach (var (group, genes) in markers)
            foreach (var gene in genes)
                foreach (var other in DemoDataGenerator.Groups.Select(g => g.Name).Where(g => g != group))
                    Assert.True(Mean(gene, group) > 2 * Mean(gene, other), $"{gene}: {group} {Mean(gene, group):F0} vs {other} {Mean(gene, other):F0} CPM");
        Assert.True(Mean("Kcna1", "T4-low-threshold") < 0.5 * Mean("Kcna1", "T2-adapting"));
        Assert.True(Mean("Hcn1", "T3-bursting") < 0.5 * Mean("Hcn1", "T2-adapting"));
    }
}
