using ExprModel.Core.Cell;
using ExprModel.Core.Models;
using ExprModel.Core.Recordings;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// A recorded sweep and the open model's response to the same step, for one plot: the sweep's step (pA) becomes a
/// current density through the model's membrane area (<see cref="CurrentUnits"/>), with the sweep's onset and duration,
/// and the model runs it through <see cref="ModelRunner.StepAsync"/>. <paramref name="changed"/> is called whenever
/// something shown changed.
/// </summary>
public sealed class RecordedTraceOverlay(ModelRunner runner, Func<Task> changed) : IDisposable
{
    private CancellationTokenSource? _cts;

    public RecordedSweep? Sweep { get; private set; }
    /// <summary>The recorded voltage thinned for the plot (each bucket keeps its extremes, so spike peaks survive).</summary>
    public (double[] TimeMs, double[] VoltageMv) Recorded { get; private set; } = ([], []);
    public StepView? Simulated { get; private set; }
    /// <summary>The sweep's step as the model received it (µA/cm²).</summary>
    public double? AmplitudeUaPerCm2 { get; private set; }
    /// <summary>What differs between the two runs (a holding current the model does not get).</summary>
    public string? Note { get; private set; }
    public string? Error { get; private set; }
    public bool Busy { get; private set; }
    public int Revision { get; private set; }

    /// <summary>Sweeps a model can be run with: those with a rectangular step that the recording covers.</summary>
    public static IReadOnlyList<RecordedSweep> Choices(RecordedCell cell) =>
        cell.Sweeps.Where(s => s.Step is { EndsWithRecording: false } && s.FullCommandPa is null).ToArray();

    /// <summary>The sweep shown first: the smallest step that evokes a spike in the recording, else the largest step.</summary>
    public static RecordedSweep? DefaultSweep(RecordedCell cell, RecordedReadouts readouts)
    {
        var choices = Choices(cell);
        return choices.FirstOrDefault(s => readouts.Readouts.RheobasePa is { } rb && s.Step!.AmplitudePa == rb) ?? choices.MaxBy(s => s.Step!.AmplitudePa);
    }

    /// <summary>Runs <paramref name="model"/> with <paramref name="sweep"/>'s step; a newer call cancels an older one.</summary>
    public async Task ShowAsync(ModelDocument model, RecordedSweep sweep)
    {
        _cts?.Cancel();
        _cts?.Dispose();
        _cts = new CancellationTokenSource();
        var token = _cts.Token;
        var step = sweep.Step!;
        Sweep = sweep;
        var (t, v) = (Enumerable.Range(0, sweep.VoltageMv.Length).Select(i => i * sweep.SampleIntervalMs).ToArray(), sweep.VoltageMv);
        Recorded = StepView.Thin(t, v, ModelRunner.PlotBuckets);
        Busy = true;
        Error = null;
        await changed();
        try
        {
            var geometry = model.Cell.ToGeometry();
            AmplitudeUaPerCm2 = CurrentUnits.ToDensity(step.AmplitudePa, CurrentUnit.Pa, geometry);
            Note = Math.Abs(step.HoldingPa) > RecordedStep.MinimumAmplitudePa
                ? $"The recording holds {step.HoldingPa:0.#} pA before and after the step; the model starts from rest without it."
                : null;
            var protocol = new StepProtocol
            {
                AmplitudeUaPerCm2 = AmplitudeUaPerCm2.Value,
                DelayMs = step.OnsetMs,
                StepMs = step.DurationMs,
                AfterMs = Math.Max(0, sweep.DurationMs - step.OffsetMs),
            };
            Simulated = await runner.StepAsync(model, protocol, token);
            Revision++;
        }
        catch (OperationCanceledException) { return; }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException or ModelFileException) { Error = e.Message; }
        finally { if (!token.IsCancellationRequested) Busy = false; }
        await changed();
    }

    public void Dispose()
    {
        _cts?.Cancel();
        _cts?.Dispose();
    }
}
