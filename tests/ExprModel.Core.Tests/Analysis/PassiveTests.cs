using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>Input resistance and time constant. A passive sphere: tau = C / g_L and R_in = 1 / (g_L A) (textbook identity).</summary>
public sealed class PassiveTests
{
    [Fact]
    public void TimeConstantAndInputResistanceMatchTheIdentity()
    {
        var leak = TestCatalog.Catalog.Resolve("leak", 1);
        double gL = 0.05, areaUm2 = 20000;
        var cell = new CompiledCell(new CellModel
        {
            Geometry = new Geometry { AreaUm2 = areaUm2, CapacitanceUfPerCm2 = 1.0 },
            Channels = [new ChannelInstance { Entry = leak, DensityMsPerCm2 = gL, ReversalMv = -70 }],
            InitialVoltageMv = -70,
        });
        var r = Features.Measure(cell);
        double tauMs = 1.0 / gL; // C [uF/cm2] / g [mS/cm2] = ms
        double rinMOhm = 1.0 / (gL * 1e-3 * areaUm2 * 1e-8) / 1e6;
        Assert.Equal(tauMs, r.MembraneTimeConstantMs!.Value, 0.01 * tauMs);
        Assert.Equal(rinMOhm, r.InputResistanceMOhm!.Value, 0.005 * rinMOhm);
        Assert.Equal(-70, r.RestingPotentialMv!.Value, 1e-6);
        Assert.Null(r.RheobaseUaPerCm2);
    }

    [Fact]
    public void A_sampled_exponential_charging_curve_gives_its_time_constant_and_resistance()
    {
        // V(t) = rest + dV (1 - exp(-t/tau)) after onset: R_in = dV / I (Ohm's law: mV / nA = MOhm), and the fit of
        // ln(1 - dV(t)/dV_end) returns tau (identity; the end of a 500 ms step at tau = 20 ms is within 1e-10 of dV).
        double dt = 0.025, rest = -70, dv = -5, tau = 20, onsetMs = 100, stepMs = 500, currentNa = -0.1;
        var v = new double[(int)Math.Round((onsetMs + stepMs) / dt) + 1];
        for (int i = 0; i < v.Length; i++)
        {
            double t = i * dt - onsetMs;
            v[i] = t <= 0 ? rest : rest + dv * (1 - Math.Exp(-t / tau));
        }
        var (deflection, rin, tauFit) = Passive.StepResponse(v, dt, onsetMs, stepMs, rest, currentNa);
        Assert.Equal(dv, deflection, 1e-9);
        Assert.Equal(dv / currentNa, rin!.Value, 1e-7);
        Assert.Equal(tau, tauFit!.Value, 1e-6);
        // A deflection against the current (an unstable rest) is not a passive response.
        var (_, rinAgainst, tauAgainst) = Passive.StepResponse(v, dt, onsetMs, stepMs, rest, -currentNa);
        Assert.Null(rinAgainst);
        Assert.Null(tauAgainst);
    }

    [Fact]
    public void The_trace_measurement_gives_the_read_outs_own_numbers_on_the_simulated_step()
    {
        // A recorded sweep is measured by the same code as a simulated one: run the read-outs' small step on a published
        // model and measure the trace; the read-out set must hold exactly these numbers.
        var cell = TestCatalog.Preset("wb1996");
        var s = ReadoutSettings.Default;
        var r = Features.MeasureFirst(cell, s);
        double g = r.SlopeConductanceMsPerCm2!.Value;
        double stepUaPerCm2 = s.PassiveDeflectionMv * g;
        var run = Simulator.Run(cell, Protocols.Step(stepUaPerCm2, Protocols.BaselineMs, s.PassiveStepMs), Protocols.BaselineMs + s.PassiveStepMs,
            s.Simulation with { RecordEvery = 1, RecordCurrents = false }, r.RestState);
        var (_, rin, tau) = Passive.StepResponse(run.VoltageMv, s.Simulation.DtMs, Protocols.BaselineMs, s.PassiveStepMs, r.RestState!.VoltageMv,
            CurrentUnits.FromDensity(stepUaPerCm2, CurrentUnit.Na, cell.Model.Geometry));
        Assert.Equal(r.InputResistanceMOhm, rin);
        Assert.Equal(r.MembraneTimeConstantMs, tau);
    }
}
