using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// Runs one library call (knock-down, sensitivity, fit) as a background job inside the <see cref="SimulationGate"/>'s
/// bound: the call runs on a scheduler of its own that lets one model evaluation run at a time (the library's parallel
/// loops pick up <see cref="TaskScheduler.Current"/>), and it holds one gate slot, which it gives back after every model
/// evaluation (<c>checkpoint</c>, called from the library's progress callback) and takes again behind whoever waited
/// meanwhile. So a long fit counts as one simulation, and the live slider loop waits at most one evaluation for a slot.
/// </summary>
public static class GatedWorker
{
    /// <param name="work">The library call; it calls the checkpoint after each model evaluation.</param>
    public static async Task<T> RunAsync<T>(SimulationGate gate, Func<Action, T> work, CancellationToken cancel)
    {
        var lease = await GateLease.AcquireAsync(gate, cancel).ConfigureAwait(false);
        var slotLock = new object();
        void Checkpoint()
        {
            cancel.ThrowIfCancellationRequested();
            lock (slotLock)
            {
                lease.Dispose();
                lease = GateLease.AcquireAsync(gate, cancel).GetAwaiter().GetResult();
            }
        }
        var oneAtATime = new ConcurrentExclusiveSchedulerPair(TaskScheduler.Default, maxConcurrencyLevel: 1);
        try
        {
            return await Task.Factory.StartNew(() => work(Checkpoint), cancel, TaskCreationOptions.DenyChildAttach,
                oneAtATime.ConcurrentScheduler).ConfigureAwait(false);
        }
        finally
        {
            lock (slotLock) lease.Dispose();
            oneAtATime.Complete();
        }
    }
}
