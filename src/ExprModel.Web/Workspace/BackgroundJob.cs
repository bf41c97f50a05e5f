using System.Diagnostics;
using ExprModel.Core.Simulation;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// A what-if run (knock-down, sensitivity, fit) as a cancellable background job inside the simulation gate's bound
/// (<see cref="GatedWorker"/>): busy, progress, cancelled or failed, for the page and for tests. A new start cancels the
/// run before it. <paramref name="changed"/> is called when something shown changed (progress at most a few times a second).
/// </summary>
public sealed class BackgroundJob(SimulationGate gate, Func<Task> changed) : IDisposable
{
    /// <summary>Shortest time between two progress redraws.</summary>
    private static readonly TimeSpan RedrawEvery = TimeSpan.FromMilliseconds(250);

    private CancellationTokenSource? _cts;
    private readonly Stopwatch _sinceRedraw = new();

    public bool Busy { get; private set; }
    /// <summary>The user stopped the last run.</summary>
    public bool Cancelled { get; private set; }
    /// <summary>Why the last run failed, in words the user can act on; null when it did not.</summary>
    public string? Error { get; private set; }
    /// <summary>Work done of <see cref="Total"/> (0 of 0 when the total is not known in advance).</summary>
    public int Done { get; private set; }
    public int Total { get; private set; }
    /// <summary>Progress in words, when counts alone do not say it (a fit's starts and best objective).</summary>
    public string? Status { get; private set; }
    /// <summary>The run started last (completed when it ends, however it ends).</summary>
    public Task Running { get; private set; } = Task.CompletedTask;

    /// <summary>Starts <paramref name="work"/> (a library call given the checkpoint to call after each model evaluation).</summary>
    /// <param name="finished">Gets the result on success.</param>
    public void Start<T>(Func<Action, CancellationToken, T> work, Action<T> finished)
    {
        _cts?.Cancel();
        _cts?.Dispose();
        _cts = new CancellationTokenSource();
        var token = _cts.Token;
        Busy = true; Cancelled = false; Error = null; Done = 0; Total = 0; Status = null;
        Running = RunAsync(work, finished, token);
    }

    private async Task RunAsync<T>(Func<Action, CancellationToken, T> work, Action<T> finished, CancellationToken token)
    {
        try
        {
            await changed();
            var result = await GatedWorker.RunAsync(gate, checkpoint => work(checkpoint, token), token);
            if (token.IsCancellationRequested) return;
            finished(result);
        }
        catch (Exception) when (token.IsCancellationRequested)
        {
            // Cancelled: by the user (Cancel says so) or by a newer run of the same kind.
            return;
        }
        catch (Exception e) when (e is ArgumentException or UserInputException or SimulationTimeoutException or ModelException)
        {
            Error = e.Message;
        }
        Busy = false;
        await changed();
    }

    /// <summary>Progress from the library (any thread); redraws at most every <see cref="RedrawEvery"/>.</summary>
    public void Report(int done, int total, string? status = null)
    {
        Done = done; Total = total; Status = status;
        lock (_sinceRedraw)
        {
            if (_sinceRedraw.IsRunning && _sinceRedraw.Elapsed < RedrawEvery) return;
            _sinceRedraw.Restart();
        }
        _ = changed();
    }

    /// <summary>Stops the run at the user's request.</summary>
    public void Cancel()
    {
        if (!Busy) return;
        _cts?.Cancel();
        Busy = false;
        Cancelled = true;
        _ = changed();
    }

    public void Dispose()
    {
        _cts?.Cancel();
        _cts?.Dispose();
    }
}
