using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Core.Tests.Simulation;

namespace ExprModel.Core.Tests.Cell;

/// <summary>
/// The sodium shell and the sodium-gated (KNa) gate: mass balance against the integrated sodium current, the Hill steady
/// state against its formula, the SIMD sweep and the RK4 reference against the scalar loop, and the adaptation KNa causes.
/// </summary>
public class SodiumShellTests
{
    /// <summary>Faraday constant, CODATA 2018 (exact in the 2019 SI), C/mol: written here, not taken from the project.</summary>
    private const double FaradayCodata = 96485.33212;

    /// <summary>The fast-spiking cortical preset (Pospischil et al. 2008) with the catalog's KNa entry at <paramref name="knaDensity"/>.</summary>
    private static CellModel FastSpikingWithKna(double knaDensity, SodiumShell? shell = null)
    {
        var cat = TestCatalog.Catalog;
        var model = cat.Preset("cortex-fs2008").ToCellModel(cat.Resolve);
        var kna = new ChannelInstance { Entry = cat.Resolve("kna-compte2003", null), DensityMsPerCm2 = knaDensity };
        return model with { Channels = [.. model.Channels, kna], SodiumShell = shell };
    }

    [Fact]
    public void Shell_sodium_change_equals_the_integrated_sodium_current_over_F_times_the_shell_volume()
    {
        // No extrusion to speak of (decay 1e7 ms): the shell only integrates the current. d[Na] = -integral(I_Na dt) / (F d).
        const double depthUm = 0.5;
        var cell = new CompiledCell(FastSpikingWithKna(0.49, new SodiumShell { DepthUm = depthUm, DecayMs = 1e7 }));
        var settings = new SimulationSettings { DtMs = 0.005, RecordEvery = 1, RecordCurrents = true };
        var trace = Simulator.Run(cell, new StepCurrent(20, 200, 3), 250, settings);
        Assert.True(trace.SpikeTimesMs.Count >= 10, $"only {trace.SpikeTimesMs.Count} spikes");
        var ina = trace.ChannelCurrentsUaPerCm2["traub-na"];
        double charge = 0; // uA ms / cm2 = nC / cm2
        for (int i = 1; i < ina.Length; i++) charge += 0.5 * (ina[i] + ina[i - 1]) * settings.DtMs;
        // nC/cm2 -> mol/cm2: 1e-9 / F; shell volume per cm2: d um = d x 1e-4 cm -> d x 1e-7 L; mol/L -> mM: 1e3.
        double expected = -charge * 1e-9 / FaradayCodata / (depthUm * 1e-7) * 1e3;
        double actual = trace.SodiumMm![^1] - trace.SodiumMm[0];
        Assert.True(expected > 0.1, $"sodium gain {expected} mM too small to test");
        // 1 %: the loop takes the current at the step's midpoint, the record at its end (trapezoid on recorded samples).
        Assert.True(Math.Abs(actual - expected) <= 0.01 * expected, $"shell gained {actual:G5} mM, integrated current gives {expected:G5} mM");
    }

    [Theory]
    [InlineData(3.5, 38.7)]
    [InlineData(4.0, 20.0)]
    [InlineData(-2.0, 15.0)]
    public void Sodium_gate_steady_state_is_the_Hill_function_of_shell_sodium(double hill, double halfMm)
    {
        var entry = TestCatalog.Catalog.Resolve("kna-compte2003", null);
        var gate = entry.Gates[0] with { Sodium = new SodiumSensitivity(halfMm, hill, 0) };
        var model = FastSpikingWithKna(0.49);
        var variant = new ChannelInstance { Entry = entry with { Gates = [gate] }, DensityMsPerCm2 = 0.49 };
        model = model with { Channels = [.. model.Channels.SkipLast(1), variant] };
        var cell = new CompiledCell(model);
        int g = cell.GateCount - 1;
        foreach (double na in new[] { 1.0, 10, 15, 38.7, 60, 200 })
        {
            // Hill (1910) form: x = na^n / (na^n + K^n); for a negative n, K^m / (K^m + na^m), m = -n.
            double m = Math.Abs(hill), expected = hill > 0 ? Math.Pow(na, m) / (Math.Pow(na, m) + Math.Pow(halfMm, m))
                : Math.Pow(halfMm, m) / (Math.Pow(halfMm, m) + Math.Pow(na, m));
            Assert.Equal(expected, cell.GateSteadyState(g, -60, 5e-5, na), 12);
            Assert.Equal(expected, gate.SteadyStateAt(-60, sodiumMm: na), 12);
        }
    }

    [SimdFact]
    public void Simd_sweep_matches_scalar_loop_with_sodium_shell_and_kna()
    {
        var cell = new CompiledCell(FastSpikingWithKna(1.0, new SodiumShell { DepthUm = 0.2 }));
        var scalar = SimdAgreement.Check(cell, [0, 1, 2, 3, 5, 8], 1000, "fs + KNa");
        Assert.True(scalar.Sum(p => p.SpikesInStep) > 100);
    }

    [Fact]
    public void Fast_loop_agrees_with_rk4_reference_on_spike_times_and_shell_sodium()
    {
        var cell = new CompiledCell(FastSpikingWithKna(1.0, new SodiumShell { DepthUm = 0.2, DecayMs = 300 }));
        var step = new StepCurrent(20, 280, 4);
        var fast = Simulator.Run(cell, step, 300, new SimulationSettings { DtMs = 0.005, RecordEvery = 0 });
        var reference = ReferenceIntegrator.Run(cell, step, 300, dtMs: 0.001, recordEvery: 0);
        Assert.True(reference.SpikeTimesMs.Count >= 10, $"only {reference.SpikeTimesMs.Count} reference spikes");
        Assert.Equal(reference.SpikeTimesMs.Count, fast.SpikeTimesMs.Count);
        for (int i = 0; i < reference.SpikeTimesMs.Count; i++)
            Assert.True(Math.Abs(reference.SpikeTimesMs[i] - fast.SpikeTimesMs[i]) < 0.1, $"spike {i}: {fast.SpikeTimesMs[i]} vs {reference.SpikeTimesMs[i]}");
        double naRef = reference.FinalState.SodiumMm, naFast = fast.FinalState.SodiumMm;
        Assert.True(naRef > cell.Model.SodiumShellRestMm + 0.5, $"shell sodium {naRef} barely rose");
        Assert.True(Math.Abs(naFast - naRef) <= 0.01 * (naRef - cell.Model.SodiumShellRestMm), $"shell sodium {naFast} vs reference {naRef}");
    }

    [Fact]
    public void Kna_slows_firing_over_a_long_step_and_adapts_it()
    {
        // Common practice: sodium-activated potassium builds up with sodium entry over a train and lengthens late ISIs.
        var plain = new CompiledCell(FastSpikingWithKna(0));
        var kna = new CompiledCell(FastSpikingWithKna(1.0));
        var step = new StepCurrent(100, 2000, 3);
        var p = Simulator.Run(plain, step, 2100, SimulationSettings.SpikesOnly).SpikeTimesMs;
        var k = Simulator.Run(kna, step, 2100, SimulationSettings.SpikesOnly).SpikeTimesMs;
        static double Rate(IReadOnlyList<double> s, double from, double to) => s.Count(t => t >= from && t < to) / ((to - from) / 1000);
        double plainEarly = Rate(p, 100, 400), plainLate = Rate(p, 1800, 2100), knaEarly = Rate(k, 100, 400), knaLate = Rate(k, 1800, 2100);
        Assert.True(knaLate < plainLate, $"late rate with KNa {knaLate} Hz, without {plainLate} Hz");
        Assert.True(knaLate / knaEarly < plainLate / plainEarly - 0.05,
            $"late/early with KNa {knaLate}/{knaEarly} Hz, without {plainLate}/{plainEarly} Hz");
    }

    [Fact]
    public void A_model_without_sodium_gated_channels_has_no_sodium_shell_state()
    {
        var cell = TestCatalog.Preset("cortex-fs2008");
        Assert.False(cell.HasSodiumShell);
        Assert.Equal(cell.GateCount + 1, cell.StateLength);
        var withKna = new CompiledCell(FastSpikingWithKna(0.49));
        Assert.True(withKna.HasSodiumShell);
        Assert.Equal(withKna.GateCount + 2, withKna.StateLength);
        Assert.Equal(IonConcentrations.Mammalian.SodiumInsideMm, withKna.InitialState().SodiumMm);
    }

    [Fact]
    public void Model_file_reads_sodium_shell_and_names_a_bad_field()
    {
        var cat = TestCatalog.Catalog;
        var doc = cat.Preset("cortex-fs2008") with { SodiumShell = new SodiumShell { DepthUm = 0.3, DecayMs = 500, RestMm = 8 } };
        var back = ModelDocument.Parse(doc.ToJson());
        Assert.Equal(doc.SodiumShell, back.SodiumShell);
        Assert.Contains("\"sodiumShell\"", doc.ToJson());
        var bad = back with { SodiumShell = new SodiumShell { DepthUm = 0 } };
        var e = Assert.Throws<ModelException>(() => new CompiledCell(bad.ToCellModel(cat.Resolve)));
        Assert.Contains("sodiumShell.depthUm", e.Message);
    }
}
