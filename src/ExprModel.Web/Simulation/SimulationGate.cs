using ExprModel.Web.Hosting;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Simulation;

/// <summary>
/// Bounds the server's simulation work: at most <see cref="WebOptions.MaxConcurrentSimulations"/> run at once (the
/// rest wait), and each is cancelled when it passes <see cref="WebOptions.SimulationTimeoutSeconds"/> or when its
/// caller gives up (a closed page, a newer slider position).
/// </summary>
public sealed class SimulationGate
{
    private readonly SemaphoreSlim _slots;
    private readonly TimeSpan _timeout;

    public SimulationGate(IOptions<WebOptions> options)
    {
        var o = options.Value;
        _slots = new SemaphoreSlim(Math.Max(1, o.MaxConcurrentSimulations));
        _timeout = TimeSpan.FromSeconds(o.SimulationTimeoutSeconds > 0 ? o.SimulationTimeoutSeconds : 30);
    }

    public TimeSpan Timeout => _timeout;

    /// <summary>Runs <paramref name="work"/> on the thread pool once a slot is free, under the time cap.</summary>
    public async Task<T> RunAsync<T>(Func<CancellationToken, T> work, CancellationToken cancel)
    {
        using var capped = CancellationTokenSource.CreateLinkedTokenSource(cancel);
        capped.CancelAfter(_timeout);
        try
        {
            await _slots.WaitAsync(capped.Token).ConfigureAwait(false);
        }
        catch (OperationCanceledException) when (!cancel.IsCancellationRequested)
        {
            throw TimedOut("waiting for a free simulation slot");
        }
        try
        {
            return await Task.Run(() => work(capped.Token), capped.Token).ConfigureAwait(false);
        }
        catch (OperationCanceledException) when (!cancel.IsCancellationRequested)
        {
            throw TimedOut("simulating");
        }
        finally
        {
            _slots.Release();
        }
    }

    private SimulationTimeoutException TimedOut(string stage) =>
        new($"The request was stopped after {_timeout.TotalSeconds:0.#} s while {stage} (the server's per-request limit). " +
            "Shorten the protocol or use fewer f-I steps.");
}
