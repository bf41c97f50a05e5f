using System.Diagnostics;

namespace ExprModel.Web.Workspace;

/// <summary>Server time of the latest live update, from the control's event to the trace and to the first read-outs (ms).</summary>
public sealed class LiveUpdateTiming : ILiveUpdateObserver
{
    private long _startedAt;

    public double TraceMs { get; private set; }
    public double FirstReadoutsMs { get; private set; }

    public void Started() => _startedAt = Stopwatch.GetTimestamp();
    public void TraceReady() => TraceMs = Stopwatch.GetElapsedTime(_startedAt).TotalMilliseconds;
    public void FirstReadoutsReady() => FirstReadoutsMs = Stopwatch.GetElapsedTime(_startedAt).TotalMilliseconds;
}
