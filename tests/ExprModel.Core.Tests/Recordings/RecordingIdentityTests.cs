using ExprModel.Core.Analysis;
using ExprModel.Core.Recordings;
using ExprModel.Core.Simulation;
using ExprModel.Core.Tests.Expression;

namespace ExprModel.Core.Tests.Recordings;

/// <summary>
/// Identity: a simulated step family of a published model (Wang and Buzsaki 1996, J Neurosci 16:6402), written as an NWB
/// recording by our writer and read back, gives the read-outs <see cref="Features.Measure"/> reports for that model
/// wherever the definitions coincide. The family holds the simulator's own passive step (-5 mV) and sag step (-25 mV),
/// and depolarising steps at k/10 of the simulator's rheobase (k = 1..30), so the simulator's rheobase is one of its
/// steps and the step below (0.9 x) is silent.
/// </summary>
public sealed class RecordingIdentityTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    [Fact]
    public void SimulatedFamily_WrittenAndReadBack_GivesTheSimulatorsReadouts()
    {
        var cell = TestCatalog.Preset("wb1996");
        var s = ReadoutSettings.Default;
        var sim = Features.Measure(cell, s);
        var geometry = cell.Model.Geometry;
        double g = sim.SlopeConductanceMsPerCm2!.Value, rb = sim.RheobaseUaPerCm2!.Value;
        var steps = new List<(double Density, double StepMs, double TailMs)>
        {
            (s.PassiveDeflectionMv * g, s.PassiveStepMs, 50), // the simulator's passive step
            (s.SagDeflectionMv * g, 1000, 50),                // its sag step
        };
        for (int k = 1; k <= 30; k++) steps.Add((k == 10 ? rb : rb * k / 10, s.StepDurationMs, 20));
        double dt = s.Simulation.DtMs;
        var sweeps = steps.Select((st, n) =>
        {
            var stim = Protocols.Step(st.Density, 100, st.StepMs);
            var trace = Simulator.Run(cell, stim, 100 + st.StepMs + st.TailMs, s.Simulation with { RecordEvery = 1 }, sim.RestState);
            var pa = trace.TimeMs.Select(t => geometry.DensityToPicoamps(stim.DensityAt(t))).ToArray();
            return RecordedSweep.Create(n + 1, dt, trace.VoltageMv, pa, "simulated");
        }).ToArray();
        var path = Path.Combine(_files.Dir, "wb1996.nwb");
        NwbWriter.Write(path, new NwbSession
        {
            Identifier = "wb1996",
            Cells = [new RecordedCell { CellId = "wb1996", Source = "simulated", Sweeps = sweeps }],
        });
        var recorded = RecordingFeatures.Measure(Assert.Single(NwbReader.Read(path)));
        var r = recorded.Readouts;

        // Tolerances: float32 storage of mV (about 4e-6 mV at -65 mV) and pA (1e-7 relative); the simulator's spike at
        // rheobase is recorded from a resume point of its search, which matches a whole run to 1e-6 ms (DEVELOPERS.md).
        Assert.Equal(0, recorded.SmoothingMs);
        Assert.Equal(sim.RestingPotentialMv!.Value, r.RestingPotentialMv!.Value, 1e-3);
        Assert.Equal(sim.InputResistanceMOhm!.Value, r.InputResistanceMOhm!.Value, sim.InputResistanceMOhm.Value * 1e-3);
        Assert.Equal(sim.MembraneTimeConstantMs!.Value, r.MembraneTimeConstantMs!.Value, sim.MembraneTimeConstantMs.Value * 1e-3);
        // The sag trough is taken from a 1 ms moving average (the simulator takes the raw minimum): equal within 0.01.
        Assert.Equal(sim.SagRatio!.Value, r.SagRatio!.Value, 0.01);
        // Rheobase: the smallest spiking step is the simulator's rheobase; its resolution is the family's spacing, 0.1 x.
        Assert.Equal(sim.RheobasePa!.Value, r.RheobasePa!.Value, sim.RheobasePa.Value * 1e-5);
        Assert.Equal(0.1 * sim.RheobasePa.Value, recorded.RheobaseStepSpacingPa!.Value, sim.RheobasePa.Value * 1e-5);
        Assert.Equal(sim.ThresholdMv!.Value, r.ThresholdMv!.Value, 1e-3);
        Assert.Equal(sim.PeakMv!.Value, r.PeakMv!.Value, 1e-3);
        Assert.Equal(sim.AmplitudeMv!.Value, r.AmplitudeMv!.Value, 1e-3);
        Assert.Equal(sim.HalfWidthMs!.Value, r.HalfWidthMs!.Value, 1e-3);
        Assert.Equal(sim.AfterHyperpolarisationMv!.Value, r.AfterHyperpolarisationMv!.Value, 1e-3);
        Assert.Equal(sim.MaxRiseMvPerMs!.Value, r.MaxRiseMvPerMs!.Value, sim.MaxRiseMvPerMs.Value * 1e-3);
        Assert.Equal(sim.FirstSpikeLatencyMs!.Value, r.FirstSpikeLatencyMs!.Value, 1e-3);

        // Rates per step: the simulator's f-I points at the family's amplitudes (its SIMD sweep) against the recording's.
        var depolarising = steps.Skip(2).Select(st => st.Density).ToArray();
        var simulated = FiCurve.Measure(cell, depolarising, s.StepDurationMs, sim.RestState, s.Simulation);
        Assert.Equal(simulated.Select(p => p.SpikesInStep), recorded.FiCurve.Select(p => p.Rates.SpikesInStep));
        foreach (var (a, b) in simulated.Zip(recorded.FiCurve))
        {
            Assert.Equal(a.FirstIsiRateHz, b.Rates.FirstIsiRateHz, Math.Max(1e-3, a.FirstIsiRateHz * 1e-4));
            Assert.Equal(a.LateRateHz, b.Rates.LateRateHz, Math.Max(1e-3, a.LateRateHz * 1e-4));
        }
        // Gain: the same least-squares definition on the same steps; Hz per uA/cm2 to Hz/nA by the cell's area.
        double simGainHzPerNa = FiCurve.Gain(simulated)!.Value / (geometry.AreaUm2 * 1e-5);
        Assert.Equal(simGainHzPerNa, r.FiGainHzPerNa!.Value, simGainHzPerNa * 1e-4);
        // Adaptation: the simulator reads it on 2 x rheobase for this class 1 model, which is the family's step k = 20.
        Assert.Equal(2 * rb, sim.AdaptationStepUaPerCm2!.Value, rb * 1e-9);
        Assert.Equal(sim.AdaptationRatio!.Value, r.AdaptationRatio!.Value, 1e-4);
        Assert.Equal(sim.AdaptationIndex!.Value, r.AdaptationIndex!.Value, 1e-4);
    }
}
