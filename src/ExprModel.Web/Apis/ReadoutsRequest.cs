namespace ExprModel.Web.Apis;

public sealed record ReadoutsRequest : ModelRequest;
