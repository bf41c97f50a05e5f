using ExprModel.Core.Kinetics;
using ExprModel.Core.Stochastic;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests.Stochastic;

/// <summary>
/// The patch set-ups the stochastic tests and the stochastic benchmark share (this file is linked into
/// tests/ExprModel.Benchmarks): squid-axon channels (Hodgkin &amp; Huxley 1952 entries) with the catalog's unitary
/// conductance of the entry, so each caller states only what its check varies, with <c>with { ... }</c>.
/// </summary>
public static class PatchEnsembles
{
    /// <summary>Sodium channels held at -90 mV (all inactivation removed) and stepped to <paramref name="stepMv"/>.</summary>
    public static PatchSettings SodiumStep(ChannelCatalog catalog, int channels, int sweeps, double stepMv = 0) =>
        Patch(catalog, "squid-na-hh1952", channels, sweeps) with { HoldingMv = -90, StepMv = stepMv };

    /// <summary>Delayed-rectifier channels held and "stepped" at one voltage: a stationary patch (no step at all).</summary>
    public static PatchSettings PotassiumAt(ChannelCatalog catalog, double vMv, int channels, int sweeps) =>
        Patch(catalog, "squid-k-hh1952", channels, sweeps) with { HoldingMv = vMv, StepMv = vMv, PreStepMs = 0 };

    private static PatchSettings Patch(ChannelCatalog catalog, string id, int channels, int sweeps)
    {
        ChannelEntry entry = catalog.Resolve(id, null);
        return new PatchSettings
        {
            Entry = entry,
            UnitaryConductancePs = catalog.UnitaryConductances.For(entry).ConductancePs,
            ChannelCount = channels,
            Sweeps = sweeps,
        };
    }
}
