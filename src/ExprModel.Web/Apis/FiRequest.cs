using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

public sealed record FiRequest : ModelRequest
{
    public FiProtocol? Fi { get; init; }
}
