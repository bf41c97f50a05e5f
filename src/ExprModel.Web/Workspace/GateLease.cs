using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// One of the <see cref="SimulationGate"/>'s slots held by a background job while its own thread simulates: a gate run
/// whose work only waits until the lease is disposed. The gate's per-request cap still ends the hold (the slot is then
/// free again and the job takes a new lease at its next model evaluation).
/// </summary>
public sealed class GateLease : IDisposable
{
    private readonly ManualResetEventSlim _release = new();
    private Task _holding = Task.CompletedTask;

    private GateLease() { }

    /// <summary>Waits for a free slot (as every simulation request does) and holds it.</summary>
    /// <exception cref="SimulationTimeoutException">No slot came free within the gate's cap.</exception>
    public static async Task<GateLease> AcquireAsync(SimulationGate gate, CancellationToken cancel)
    {
        var lease = new GateLease();
        var held = new TaskCompletionSource(TaskCreationOptions.RunContinuationsAsynchronously);
        lease._holding = gate.RunAsync(token =>
        {
            held.TrySetResult();
            WaitHandle.WaitAny([lease._release.WaitHandle, token.WaitHandle]);
            return 0;
        }, cancel);
        // A hold that ends by the gate's cap is not an error of the job: observe it so it is not reported as unobserved.
        _ = lease._holding.ContinueWith(t => t.Exception, TaskContinuationOptions.OnlyOnFaulted | TaskContinuationOptions.ExecuteSynchronously);
        await Task.WhenAny(held.Task, lease._holding).ConfigureAwait(false);
        if (!held.Task.IsCompleted) await lease._holding.ConfigureAwait(false);
        return lease;
    }

    public void Dispose() => _release.Set();
}
