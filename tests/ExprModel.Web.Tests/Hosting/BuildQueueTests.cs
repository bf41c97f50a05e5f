using ExprModel.Web.Hosting;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Hosting;

public sealed class BuildQueueTests
{
    private static BuildQueue Queue(int running, int queued) =>
        new(Options.Create(new WebOptions { MaxConcurrentBuilds = running, MaxQueuedBuilds = queued }));

    [Fact]
    public async Task Past_the_running_and_waiting_slots_a_request_is_refused_at_once_and_a_freed_slot_is_reused()
    {
        var queue = Queue(running: 1, queued: 1);
        var first = await queue.EnterAsync(CancellationToken.None);
        var waiting = queue.EnterAsync(CancellationToken.None);
        Assert.False(waiting.IsCompleted);
        var busy = await Assert.ThrowsAsync<ServerBusyException>(() => queue.EnterAsync(CancellationToken.None));
        Assert.Contains("MaxConcurrentBuilds", busy.Message);
        Assert.Equal(BuildQueue.RetryAfterSeconds, busy.RetryAfterSeconds);
        first.Dispose();
        first.Dispose(); // twice is harmless
        using var second = await waiting.WaitAsync(TimeSpan.FromSeconds(30));
        Assert.Equal(1, queue.Admitted);
    }

    [Fact]
    public async Task A_waiting_request_whose_client_goes_away_leaves_the_queue()
    {
        var queue = Queue(running: 1, queued: 1);
        using var first = await queue.EnterAsync(CancellationToken.None);
        using var gone = new CancellationTokenSource();
        var waiting = queue.EnterAsync(gone.Token);
        gone.Cancel();
        await Assert.ThrowsAnyAsync<OperationCanceledException>(() => waiting);
        Assert.Equal(1, queue.Admitted);
        // Its place in the queue is free again.
        var next = queue.EnterAsync(CancellationToken.None);
        Assert.False(next.IsCompleted);
        first.Dispose();
        (await next).Dispose();
        Assert.Equal(0, queue.Admitted);
    }
}
