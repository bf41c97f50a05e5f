using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

public sealed record SimulateRequest : ModelRequest
{
    public StepProtocol? Step { get; init; }
}
