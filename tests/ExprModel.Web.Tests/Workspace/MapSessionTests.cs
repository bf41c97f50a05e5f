using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>The Map page's state driven without a renderer, on the shipped demo survey (grouped by its "group" column).</summary>
public sealed class MapSessionTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-map-" + Guid.NewGuid().ToString("N"));
    private readonly ModelRunner _runner;
    private readonly WorkspaceState _workspace = new();

    public MapSessionTests()
    {
        Directory.CreateDirectory(_dir);
        var catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        _runner = new ModelRunner(catalog, new SimulationGate(Options.Create(new WebOptions())));
        var demo = Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo");
        _workspace.Session = ExpressionSession.Read(catalog, File.ReadAllBytes(Path.Combine(demo, "counts.csv")), "counts.csv",
            File.ReadAllBytes(Path.Combine(demo, "metadata.csv")), "metadata.csv", new ReadChoices(null, null, "group"));
    }

    private MapSession NewSession() => new(_workspace, _runner, () => Task.CompletedTask);

    [Fact]
    public async Task Building_per_group_then_measuring_gives_each_models_own_readouts()
    {
        using var session = NewSession();
        Assert.NotNull(session.Report);
        await session.BuildAllAsync();
        Assert.Null(session.Error);
        Assert.Equal(session.GroupNames, _workspace.GroupModels.Keys.Order(StringComparer.Ordinal));
        await session.RunBatchAsync();
        Assert.Equal(_workspace.GroupModels.Count, session.BatchDone);
        foreach (var (label, doc) in _workspace.GroupModels)
            Assert.Equal(ModelRunner.Readouts(_runner.Compile(doc), CancellationToken.None).Rows, session.BatchRows[label].Rows);
    }

    [Fact]
    public async Task An_override_drops_the_built_models_and_a_bad_weight_is_refused()
    {
        using var session = NewSession();
        await session.BuildAllAsync();
        var gene = session.Report!.Genes[0].Symbol;
        session.SetExclude(gene, true);
        Assert.Empty(_workspace.GroupModels);
        Assert.True(session.Report!.Genes.Single(g => g.Symbol == gene).Excluded);
        Assert.Equal($"{gene} excluded", MapSession.Describe(Assert.Single(_workspace.Overrides)));

        session.SetWeight(gene, "-1");
        Assert.Contains("0 or more", session.Error);
        session.SetWeight(gene, "0.5");
        Assert.Equal("0.5", session.WeightOverride(gene));
        session.ClearOverrides();
        Assert.Empty(_workspace.Overrides);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
