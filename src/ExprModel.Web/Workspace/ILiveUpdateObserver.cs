namespace ExprModel.Web.Workspace;

/// <summary>
/// Follows one live update of the Workbench from the control's event to its trace and first read-outs being ready, for
/// measurement (the browser latency benchmark); the live loop runs the same with or without one.
/// </summary>
public interface ILiveUpdateObserver
{
    /// <summary>A control changed and a new live update starts.</summary>
    void Started();
    void TraceReady();
    void FirstReadoutsReady();
}
