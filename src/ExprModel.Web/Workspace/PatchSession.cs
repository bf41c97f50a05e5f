using ExprModel.Core.Kinetics;
using ExprModel.Web.Apis;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Patch page without its page: the chosen entry, channel count, voltage step, sweeps and seed; the latest result
/// (the same view the HTTP API returns); errors naming the field. <paramref name="changed"/> is called when something
/// shown changes.
/// </summary>
public sealed class PatchSession(ModelRunner runner, Func<Task> changed)
{
    /// <summary>Entries that have kinetic states (at least one gate that is not instantaneous), by family and id.</summary>
    public IReadOnlyList<ChannelEntry> Entries { get; } = runner.Catalog.Latest.Where(e => e.Gates.Any(g => !g.Instantaneous)).ToArray();

    public string EntryId { get; set; } = "squid-na-hh1952";
    public int Channels { get; set; } = 20;
    public double HoldingMv { get; set; } = -90;
    public double StepMv { get; set; }
    public double StepMs { get; set; } = 20;
    public int Sweeps { get; set; } = 100;
    public long Seed { get; set; } = 1;
    /// <summary>Unitary conductance typed by the user (pS); null = the catalog's value.</summary>
    public double? ConductancePs { get; set; }

    public PatchResponse? Result { get; private set; }
    public string? Error { get; private set; }
    public bool Running { get; private set; }

    /// <summary>The catalog's unitary conductance of the chosen entry, with its basis and citation.</summary>
    public Core.Stochastic.UnitaryConductance? CatalogConductance =>
        runner.Catalog.Contains(EntryId) ? runner.Catalog.UnitaryConductances.For(runner.Catalog.Resolve(EntryId, null)) : null;

    public PatchRequest Request() => new(EntryId, Channels: Channels, HoldingMv: HoldingMv, StepMv: StepMv, PreStepMs: Math.Min(5, StepMs / 4),
        StepMs: StepMs, PostStepMs: 0, Sweeps: Sweeps, KeptSweeps: 5, ConductancePs: ConductancePs,
        SampleIntervalMs: Math.Max(0.02, Math.Round(StepMs / 500, 3)), Seed: Seed);

    /// <summary>Runs the patch with the current fields; a bad field becomes <see cref="Error"/> and the last result stays.</summary>
    public async Task RunAsync(CancellationToken cancel = default)
    {
        Error = null;
        Running = true;
        await changed();
        try
        {
            var (settings, unitary) = Request().ToSettings(runner.Catalog);
            Result = PatchResponse.From(await runner.PatchAsync(settings, cancel), unitary);
        }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException)
        {
            Error = e.Message;
        }
        finally
        {
            Running = false;
        }
        await changed();
    }
}
