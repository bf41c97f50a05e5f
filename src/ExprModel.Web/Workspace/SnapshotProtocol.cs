using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>The protocol a snapshot's read-outs were taken with.</summary>
public sealed record SnapshotProtocol
{
    public StepProtocol Step { get; init; } = new();
    public FiProtocol Fi { get; init; } = new();
    /// <summary>The protocols area's protocol last run (absent in links shared before it was stored).</summary>
    public InjectedProtocol? Injected { get; init; }
}
