using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The user's own f-I sweep, run in chunks of the library's <see cref="ExprModel.Core.Analysis.AmplitudeGrid.Chunks"/>
/// so the page shows progress and the user can cancel between chunks. A new sweep cancels the one before.
/// </summary>
public sealed class FiSweepJob(ModelRunner runner, Func<Task> changed) : IDisposable
{
    private CancellationTokenSource? _cts;

    public bool Busy { get; private set; }
    /// <summary>The user stopped the last sweep.</summary>
    public bool Cancelled { get; private set; }
    /// <summary>Steps done of <see cref="Total"/>.</summary>
    public int Done { get; private set; }
    public int Total { get; private set; }
    /// <summary>The sweep started last (completed when it ends, however it ends).</summary>
    public Task Running { get; private set; } = Task.CompletedTask;

    /// <param name="finished">Gets the whole curve.</param>
    /// <param name="failed">Gets a message for the user.</param>
    public void Start(ModelDocument doc, FiProtocol sweep, Action<IReadOnlyList<FiRow>> finished, Action<string> failed)
    {
        _cts?.Cancel();
        _cts?.Dispose();
        _cts = new CancellationTokenSource();
        Running = RunAsync(doc, sweep, finished, failed, _cts.Token);
    }

    private async Task RunAsync(ModelDocument doc, FiProtocol sweep, Action<IReadOnlyList<FiRow>> finished, Action<string> failed, CancellationToken token)
    {
        try
        {
            Busy = true; Cancelled = false; Done = 0; Total = sweep.Steps;
            await changed();
            var all = new List<FiRow>();
            foreach (var chunk in sweep.Grid.Chunks())
            {
                all.AddRange(await runner.FiAsync(doc, sweep.Over(chunk), token));
                Done = all.Count;
                _ = changed();
            }
            finished(all);
            Busy = false;
            await changed();
        }
        catch (OperationCanceledException) { }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException)
        {
            if (token.IsCancellationRequested) return;
            failed(e.Message);
            Busy = false;
            await changed();
        }
    }

    /// <summary>Stops the sweep because another curve replaces it (no "cancelled" message).</summary>
    public void Supersede()
    {
        _cts?.Cancel();
        Busy = false;
    }

    /// <summary>Stops the sweep at the user's request.</summary>
    public void Cancel()
    {
        _cts?.Cancel();
        Busy = false;
        Cancelled = true;
    }

    public void Dispose()
    {
        _cts?.Cancel();
        _cts?.Dispose();
    }
}
