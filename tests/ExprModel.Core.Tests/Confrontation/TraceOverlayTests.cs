using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Recordings;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Confrontation;

public sealed class TraceOverlayTests
{
    /// <summary>
    /// Identity: a model's own response, written as a 20 kHz recording with the step in pA and a holding current, overlays
    /// the same model's prediction exactly (pA to uA/cm2 through the area, same onset, duration and holding current).
    /// </summary>
    [Fact]
    public void A_models_own_response_recorded_in_pA_is_predicted_exactly()
    {
        var model = TestCatalog.Catalog.Preset("wb1996").ToCellModel(TestCatalog.Catalog.Resolve);
        var cell = new CompiledCell(model);
        const double onsetMs = 50, durationMs = 200, totalMs = 300, holdingPa = -5, stepPa = 60, dt = 0.05;
        var g = model.Geometry;
        double Density(double pa) => CurrentUnits.ToDensity(pa, CurrentUnit.Pa, g);
        var sim = ReadoutSettings.Default.Simulation;
        var rest = Simulator.Run(cell, new StepCurrent(0, 0, 0, Density(holdingPa)), ReadoutSettings.Default.SettleMs, sim with { RecordEvery = 0 }).FinalState;
        var own = Simulator.Run(cell, new StepCurrent(onsetMs, durationMs, Density(stepPa), Density(holdingPa)), totalMs, sim with { RecordEvery = 2 }, rest);
        int n = (int)Math.Round(totalMs / dt);
        var command = Enumerable.Range(0, n).Select(i => i * dt >= onsetMs && i * dt < onsetMs + durationMs ? holdingPa + stepPa : holdingPa).ToArray();
        var sweep = RecordedSweep.Create(3, dt, own.VoltageMv[..n], command, "own, sweep 3");
        var recorded = new RecordedCell { CellId = "own", Source = "own", Sweeps = [sweep] };

        var overlay = TraceOverlay.Of(recorded, 3, model);
        Assert.Equal(stepPa, overlay.Step.AmplitudePa, 9);
        Assert.Equal(holdingPa, overlay.Step.HoldingPa, 9);
        Assert.Equal(n, overlay.PredictedMv.Length);
        Assert.True(own.SpikeTimesMs.Count > 3, "the step makes the model fire, so spike timing is compared too");
        for (int i = 0; i < n; i++) Assert.True(Math.Abs(overlay.PredictedMv[i] - overlay.RecordedMv[i]) < 1e-6, $"t = {overlay.TimeMs[i]} ms");
    }

    [Fact]
    public void A_missing_sweep_is_named()
    {
        var model = TestCatalog.Catalog.Preset("wb1996").ToCellModel(TestCatalog.Catalog.Resolve);
        var cell = Recordings.SyntheticSweeps.Family(0.05);
        var e = Assert.Throws<ArgumentException>(() => TraceOverlay.Of(cell, 42, model));
        Assert.Contains("no sweep 42", e.Message);
    }
}
