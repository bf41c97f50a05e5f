namespace ExprModel.Web.Hosting;

/// <summary>The server's queue for this kind of work is full: answered 503 with a Retry-After of <see cref="RetryAfterSeconds"/>.</summary>
public sealed class ServerBusyException(string message, int retryAfterSeconds) : Exception(message)
{
    public int RetryAfterSeconds { get; } = retryAfterSeconds;
}
