using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>
/// Rest and its stability in the hh1952 preset against published properties of the Hodgkin &amp; Huxley (1952)
/// squid-axon model at 6.3 C: rest at -65 mV (Hodgkin &amp; Huxley 1952, J Physiol 117:500, modern convention); rest
/// loses stability at I = 9.78 uA/cm2 (Rinzel &amp; Miller 1980, Math Biosci 49:27; Guckenheimer &amp; Labouriau 1993,
/// Bull Math Biol 55:937; values from memory, so the tolerances are loose enough to say so).
/// </summary>
public sealed class RestStabilityTests
{
    private static readonly CompiledCell Cell = TestCatalog.Preset("hh1952");

    [Fact]
    public void RestsAtMinus65Millivolts()
    {
        var r = Simulator.Run(Cell, new NoCurrent(), 500, SimulationSettings.SpikesOnly);
        Assert.Empty(r.SpikeTimesMs);
        Assert.InRange(r.FinalState.VoltageMv, -65.1, -64.9);
        Assert.InRange(RestStability.SteadyVoltage(Cell, 0), -65.05, -64.95);
    }

    [Fact]
    public void RestLosesStabilityAt9Point78()
    {
        // Eigenvalues of the Jacobian with MathNet; published 9.78 uA/cm2 (from memory: +-0.05).
        double critical = RestStability.LossOfStabilityCurrent(Cell, 5, 15);
        Assert.InRange(critical, 9.73, 9.83);
        var below = RestStability.Eigenvalues(Cell, critical - 0.05);
        var above = RestStability.Eigenvalues(Cell, critical + 0.05);
        Assert.True(below.Max(e => e.Real) < 0);
        var leading = above.OrderByDescending(e => e.Real).First();
        Assert.True(leading.Real > 0);
        // A Hopf bifurcation: the crossing eigenvalues are a complex pair.
        Assert.True(Math.Abs(leading.Imaginary) > 0.1);
    }
}
