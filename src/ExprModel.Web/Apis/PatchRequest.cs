using ExprModel.Core.Stochastic;
using ExprModel.Data.Catalog;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

/// <summary>
/// A stochastic patch: <c>entry</c> (catalog id, optional <c>version</c>), channels, holding and step potentials (mV),
/// durations (ms), sweeps, kept single sweeps, optional unitary conductance (pS; default the catalog's), temperature (C),
/// calcium (mM), sample interval (ms) and seed.
/// </summary>
public sealed record PatchRequest(
    string Entry,
    int? Version = null,
    int Channels = 10,
    double HoldingMv = -90,
    double StepMv = 0,
    double PreStepMs = 5,
    double StepMs = 50,
    double PostStepMs = 0,
    int Sweeps = 100,
    int KeptSweeps = 5,
    double? ConductancePs = null,
    double? TemperatureC = null,
    double CalciumMm = 5e-5,
    double SampleIntervalMs = 0.05,
    long Seed = 1)
{
    /// <summary>The library's settings and the catalog's unitary conductance; a bad field is a <see cref="UserInputException"/>.</summary>
    public (PatchSettings Settings, UnitaryConductance Unitary) ToSettings(ChannelCatalog catalog)
    {
        if (string.IsNullOrWhiteSpace(Entry)) throw new UserInputException("entry: give a catalog entry id");
        Core.Kinetics.ChannelEntry e;
        try
        {
            e = catalog.Resolve(Entry, Version);
        }
        catch (CatalogException x)
        {
            throw new UserInputException("entry: " + x.Message);
        }
        var unitary = catalog.UnitaryConductances.For(e);
        var settings = new PatchSettings
        {
            Entry = e,
            UnitaryConductancePs = ConductancePs ?? unitary.ConductancePs,
            ChannelCount = Channels,
            HoldingMv = HoldingMv,
            StepMv = StepMv,
            PreStepMs = PreStepMs,
            StepMs = StepMs,
            PostStepMs = PostStepMs,
            Sweeps = Sweeps,
            KeptSweeps = Math.Clamp(KeptSweeps, 0, 20),
            TemperatureC = TemperatureC,
            CalciumMm = CalciumMm,
            SampleIntervalMs = SampleIntervalMs,
            Seed = Seed,
        };
        if (settings.Problem() is { } p) throw new UserInputException(p);
        if ((double)Channels * Sweeps * settings.TotalMs > 2e8)
            throw new UserInputException("channels x sweeps x duration: at most 2e8 channel-milliseconds per request (use the CLI for more)");
        return (settings, unitary);
    }
}
