namespace ExprModel.Web.Apis;

/// <summary>A build request: the table and its options (<see cref="ExpressionRequest"/>) and the target, a group or a cell.</summary>
public sealed record BuildRequest : ExpressionRequest
{
    public string? Group { get; init; }
    public string? Cell { get; init; }
}
