using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>Every entry, at its typical density, can be simulated in a spiking cell without leaving the physical range.</summary>
public class EntrySimulationTests
{
    private static ChannelEntry E(string id) => CatalogFiles.Content.Entries.Where(e => e.Id == id).MaxBy(e => e.Version)!; // the latest version

    [Theory]
    [MemberData(nameof(CatalogFiles.EntryKeys), MemberType = typeof(CatalogFiles))]
    public void Entry_runs_in_a_spiking_cell_with_a_calcium_shell(string key)
    {
        var entry = CatalogFiles.Content.Entries.Single(e => e.Key == key);
        var channels = new List<ChannelInstance>
        {
            new() { Entry = E("traub-na"), DensityMsPerCm2 = 50, ShiftMv = 0 },
            new() { Entry = E("traub-kdr"), DensityMsPerCm2 = 5 },
            new() { Entry = E("leak"), DensityMsPerCm2 = 0.05 },
            // A calcium source, so calcium-gated entries see calcium rise during spikes.
            new() { Entry = E("cav-hva-reuveni1993"), DensityMsPerCm2 = 0.3 },
        };
        if (channels.All(c => c.Entry.Key != entry.Key))
            channels.Add(new() { Entry = entry, DensityMsPerCm2 = entry.TypicalDensityMsPerCm2 });
        var model = new CellModel
        {
            Geometry = Geometry.FromDiameter(30),
            TemperatureC = 36,
            InitialVoltageMv = -70,
            CalciumShell = new CalciumShell(),
            Channels = channels,
        };
        var cell = new CompiledCell(model);
        var trace = Simulator.Run(cell, new StepCurrent(20, 150, 3), 200);
        Assert.All(trace.VoltageMv, v => Assert.InRange(v, -130, 90));
    }
}

/// <summary>Channel currents computed afterwards from recorded gate states equal the currents recorded during the run.</summary>
public class GateStateCurrentsTests
{
    private static ChannelEntry E(string id) => CatalogFiles.Content.Entries.Where(e => e.Id == id).MaxBy(e => e.Version)!; // the latest version

    [Fact]
    public void Currents_from_gate_states_match_recorded_currents_in_a_calcium_cell()
    {
        // Calcium through GHK and Nernst entries, calcium-gated SK and BK: every kind of driving term and gate.
        var ids = new[] { "traub-na", "traub-kdr", "leak", "cav-hva-reuveni1993", "cav3-t-destexhe1996", "cav1-l-jaffe1994", "sk2-kohler1996",
            "bk-moczydlowski1983", "hcn-vcn-rothman2003" };
        var cell = new CompiledCell(new CellModel
        {
            Geometry = Geometry.FromDiameter(30),
            TemperatureC = 36,
            InitialVoltageMv = -70,
            CalciumShell = new CalciumShell(),
            Channels = ids.Select(id => new ChannelInstance
            {
                Entry = E(id),
                DensityMsPerCm2 = id switch { "traub-na" => 50, "traub-kdr" => 5, "leak" => 0.05, _ => E(id).TypicalDensityMsPerCm2 }
            }).ToList(),
        });
        var stim = new StepCurrent(20, 150, 4);
        var recorded = Simulator.Run(cell, stim, 200, SimulationSettings.Default with { RecordCurrents = true });
        var states = Simulator.Run(cell, stim, 200, SimulationSettings.Default with { RecordGateStates = true });
        Assert.NotEmpty(recorded.SpikeTimesMs);
        Assert.Equal(recorded.VoltageMv, states.VoltageMv);
        var labels = Simulator.ChannelLabels(cell);
        Assert.Equal(recorded.ChannelCurrentsUaPerCm2.Keys.Order(), labels.Order());
        for (int k = 0; k < states.VoltageMv.Length; k += 7)
        {
            var i = Simulator.ChannelCurrentsAt(cell, states, k);
            for (int c = 0; c < labels.Count; c++) Assert.Equal(recorded.ChannelCurrentsUaPerCm2[labels[c]][k], i[c]);
        }

        // The Workbench records voltage only, with resume points, and runs the stretch around the first spike again
        // with gate states: the same loop from the same state, so the same samples and currents, exactly.
        var kept = Simulator.Run(cell, stim, 200, SimulationSettings.Default with { KeepResumePoints = true });
        Assert.Equal(recorded.VoltageMv, kept.VoltageMv);
        Assert.Equal(Enumerable.Range(0, 20).Select(i => i * 10.0), kept.ResumePoints.Select(r => Math.Round(r.TimeMs, 9))); // at 0, 10, ... 190 ms
        var from = kept.ResumePoints.Last(r => r.TimeMs <= kept.SpikeTimesMs[0] - 3);
        var window = Simulator.Resume(cell, stim, from, kept.SpikeTimesMs[0] + 9, SimulationSettings.Default with { RecordGateStates = true });
        Assert.Equal(from.TimeMs, window.TimeMs[0]);
        for (int k = 0; k < window.VoltageMv.Length; k++)
        {
            Assert.Equal(recorded.VoltageMv[from.Step + k], window.VoltageMv[k]);
            var i = Simulator.ChannelCurrentsAt(cell, window, k);
            for (int c = 0; c < labels.Count; c++) Assert.Equal(recorded.ChannelCurrentsUaPerCm2[labels[c]][from.Step + k], i[c]);
        }
    }
}

/// <summary>The parallel f-I sweep path and the single-trace path give the same spike counts for every entry.</summary>
public class EntrySweepConsistencyTests
{
    private static ChannelEntry E(string id) => CatalogFiles.Content.Entries.Where(e => e.Id == id).MaxBy(e => e.Version)!; // the latest version

    private static (int[] Sweep, int[] Single) Counts(ChannelEntry entry)
    {
        var channels = new List<ChannelInstance>
        {
            new() { Entry = E("traub-na"), DensityMsPerCm2 = 50 },
            new() { Entry = E("traub-kdr"), DensityMsPerCm2 = 5 },
            new() { Entry = E("leak"), DensityMsPerCm2 = 0.05 },
            new() { Entry = E("cav-hva-reuveni1993"), DensityMsPerCm2 = 0.3 },
        };
        if (channels.All(c => c.Entry.Key != entry.Key))
            channels.Add(new() { Entry = entry, DensityMsPerCm2 = entry.TypicalDensityMsPerCm2 });
        var cell = new CompiledCell(new CellModel
        {
            Geometry = Geometry.FromDiameter(30),
            TemperatureC = 36,
            InitialVoltageMv = -70,
            CalciumShell = new CalciumShell(),
            Channels = channels,
        });
        var stimuli = new[] { 2.0, 6, 12, 20 }.Select(a => (Stimulus)new StepCurrent(0, 300, a)).ToList();
        var sweep = Simulator.SpikeTimes(cell, stimuli, 300).Select(s => s.Count).ToArray();
        var single = stimuli.Select(s => Simulator.Run(cell, s, 300).SpikeTimesMs.Count).ToArray();
        return (sweep, single);
    }

    public static TheoryData<string> VoltageOrHillGatedEntries()
    {
        var data = new TheoryData<string>();
        foreach (var e in CatalogFiles.Content.Entries.Where(e => !e.Gates.Any(g => g.Kind == GateKind.Calcium && g.Calcium is null)))
            data.Add(e.Key);
        return data;
    }

    [Theory]
    [MemberData(nameof(VoltageOrHillGatedEntries))]
    public void Sweep_and_single_trace_agree(string key)
    {
        var (sweep, single) = Counts(CatalogFiles.Content.Entries.Single(e => e.Key == key));
        Assert.Equal(single, sweep);
    }

    [Fact]
    public void Sweep_and_single_trace_agree_for_the_bk_entry()
    {
        var (sweep, single) = Counts(E("bk-moczydlowski1983"));
        Assert.Equal(single, sweep);
    }
}
