using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using MathNet.Numerics.Statistics;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>
/// The every-cell confrontation on six cells of the demo survey (the first three of T1-fast and of T2-adapting, which
/// have recorded values in catalog/demo/metadata.csv): statistics checked against MathNet.Numerics on the same pairs.
/// </summary>
public sealed class ConfrontationViewTests : IDisposable
{
    private static readonly string Demo = Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo");
    private static readonly string[] Cells = ["FH1001", "FH1002", "FH1003", "FH2001", "FH2002", "FH2003"];
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-confront-" + Guid.NewGuid().ToString("N"));
    private readonly WorkspaceState _workspace = new();
    private readonly ModelRunner _runner;

    public ConfrontationViewTests()
    {
        Directory.CreateDirectory(_dir);
        var catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        _runner = new ModelRunner(catalog, new SimulationGate(Options.Create(new WebOptions())));
        // The demo counts cut to six cells (genes x cells: column 0 is the gene), the metadata to their rows.
        var counts = File.ReadAllLines(Path.Combine(Demo, "counts.csv")).Select(l => l.Split(',')).ToArray();
        var keep = new[] { 0 }.Concat(Cells.Select(c => Array.IndexOf(counts[0], c))).ToArray();
        var table = string.Join("\n", counts.Select(f => string.Join(",", keep.Select(k => f[k])))) + "\n";
        var meta = File.ReadAllLines(Path.Combine(Demo, "metadata.csv")).Where((l, i) => i == 0 || Cells.Contains(l.Split(',')[0]));
        var metadata = string.Join("\n", meta) + "\n";
        _workspace.Session = ExpressionSession.Read(catalog, System.Text.Encoding.UTF8.GetBytes(table), "six.csv", System.Text.Encoding.UTF8.GetBytes(metadata),
            "six-metadata.csv", new ReadChoices(null, "counts", "group"));
        _workspace.Recorded.UseTable(RecordingUploads.ReadFeatureTable(new UploadedFile("six-metadata.csv", System.Text.Encoding.UTF8.GetBytes(metadata))),
            true);
        _workspace.Recorded.Match(_workspace.Session.Dataset);
    }

    [Fact]
    public async Task Every_cells_readouts_are_held_against_the_recorded_values_with_the_shrunk_estimate_by_default()
    {
        using var map = new MapSession(_workspace, _runner, () => Task.CompletedTask);
        await map.BuildAllAsync();
        Assert.Equal(ShrinkageMode.Group, map.CellBatch.Shrinkage);
        await map.CellBatch.RunAsync(map.Report!, m => Assert.Null(m));
        Assert.Equal(ShrinkageMode.Group, map.CellBatch.UsedShrinkage);
        var result = map.Confrontation.Result!;
        var rheobase = result.Agreement.Single(a => a.Readout == "rheobase_absolute");
        var pairs = result.Cells.Where(c => c.Readout == "rheobase_absolute" && c.Predicted is not null && c.Recorded is not null).ToArray();
        Assert.Equal(pairs.Length, rheobase.Cells);
        Assert.True(pairs.Length >= 3, $"{pairs.Length} pairs");
        // The predicted values are the batch's own read-outs; the statistics are MathNet's on the same pairs.
        foreach (var p in pairs)
            Assert.Equal(map.CellBatch.Rows!.Single(r => r.Item == p.CellId).Readouts!.Rows().Single(r => r.Name == "rheobase_absolute").Value, p.Predicted);
        Assert.Equal(Correlation.Pearson(pairs.Select(p => p.Predicted!.Value), pairs.Select(p => p.Recorded!.Value)), rheobase.PearsonR!.Value, 1e-12);
        Assert.Equal(pairs.Average(p => Math.Abs(p.Predicted!.Value - p.Recorded!.Value)), rheobase.MeanAbsoluteError!.Value, 1e-9);
        Assert.Equal(pairs.Length, map.Confrontation.Scatter("rheobase_absolute").Sum(g => g.Points.Count));
        var csv = map.Confrontation.Csv()!;
        Assert.StartsWith("# Research tool.", csv);
        Assert.Contains(map.CellBatch.ExpressionNote, map.CellBatch.Csv());
        Assert.Contains(map.CellBatch.ExpressionNote, csv);

        // A recorded cell opens on the Workbench with its target, so its recorded values sit beside the read-outs.
        map.CellBatch.OpenCell("FH1001");
        Assert.Equal(ModelTarget.ForCell("FH1001"), _workspace.ModelTarget);
        Assert.Contains("shrunk", _workspace.ModelOrigin);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
