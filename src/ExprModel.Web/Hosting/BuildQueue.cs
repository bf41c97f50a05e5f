using Microsoft.Extensions.Options;

namespace ExprModel.Web.Hosting;

/// <summary>
/// Bounds the reading and building of uploaded expression tables (/api/build, /api/compare): at most
/// <see cref="WebOptions.MaxConcurrentBuilds"/> run at once and <see cref="WebOptions.MaxQueuedBuilds"/> more wait; a
/// request past that is refused at once with <see cref="ServerBusyException"/> (503, Retry-After). A request takes its slot
/// before its body is read, so the queue bounds the uploads held in memory too. A waiting request whose client goes away
/// leaves the queue.
/// </summary>
public sealed class BuildQueue
{
    /// <summary>The Retry-After a refused request gets: about one build of a mid-sized table.</summary>
    public const int RetryAfterSeconds = 5;

    private readonly SemaphoreSlim _slots;
    private readonly int _capacity;
    private int _admitted;

    public BuildQueue(IOptions<WebOptions> options)
    {
        var o = options.Value;
        _slots = new SemaphoreSlim(Math.Max(1, o.MaxConcurrentBuilds));
        _capacity = Math.Max(1, o.MaxConcurrentBuilds) + Math.Max(0, o.MaxQueuedBuilds);
    }

    /// <summary>Requests running or waiting now.</summary>
    public int Admitted => Volatile.Read(ref _admitted);

    /// <summary>Waits for a build slot; dispose the result to hand it back.</summary>
    /// <exception cref="ServerBusyException">Every slot is taken and the queue is full.</exception>
    public async Task<IDisposable> EnterAsync(CancellationToken cancel)
    {
        if (Interlocked.Increment(ref _admitted) > _capacity)
        {
            Interlocked.Decrement(ref _admitted);
            throw new ServerBusyException($"The server is building other tables ({_capacity} running or waiting, the limit set by "
                + $"{WebOptions.Section}:MaxConcurrentBuilds and MaxQueuedBuilds). Try again in a few seconds.", RetryAfterSeconds);
        }
        try
        {
            await _slots.WaitAsync(cancel).ConfigureAwait(false);
        }
        catch
        {
            Interlocked.Decrement(ref _admitted);
            throw;
        }
        return new Slot(this);
    }

    private sealed class Slot(BuildQueue queue) : IDisposable
    {
        private int _released;

        public void Dispose()
        {
            if (Interlocked.Exchange(ref _released, 1) != 0) return;
            queue._slots.Release();
            Interlocked.Decrement(ref queue._admitted);
        }
    }
}
