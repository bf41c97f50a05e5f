using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Simulation;

/// <summary>What one relative-density move costs the server: no compilation of kinetics, the rate tables reused.</summary>
public sealed class ModelRunnerTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-runner-" + Guid.NewGuid().ToString("N"));

    public void Dispose()
    {
        try { Directory.Delete(_dir, true); } catch (IOException) { }
    }

    [Fact]
    public async Task Density_moves_reuse_the_kinetics_of_the_first_compilation()
    {
        Directory.CreateDirectory(_dir);
        var catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        var runner = new ModelRunner(catalog, new SimulationGate(Options.Create(new WebOptions())));
        var doc = catalog.Preset("wb1996");
        var step = new StepProtocol { DelayMs = 20, StepMs = 100, AmplitudeUaPerCm2 = 2 };
        var first = runner.Compile(doc);
        foreach (var relative in new[] { 0.8, 1.25, 0.5, 1.0 })
        {
            // One Workbench move: the trace and the first read-out stage, each compiling the moved document.
            var moved = doc.WithRelativeDensities(new Dictionary<string, double> { [doc.Channels[^1].Entry] = relative });
            await runner.StepAsync(moved, step, CancellationToken.None);
            await runner.FirstReadoutsAsync(moved, null, CancellationToken.None);
            Assert.Same(first.Kinetics, runner.Compile(moved).Kinetics);
        }
        Assert.Equal(1, runner.KineticsBuilt);
        Assert.Equal(1, first.Kinetics.RateTablesBuilt);
    }
}
