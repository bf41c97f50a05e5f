namespace ExprModel.Web.Apis;

public sealed record MethodsRequest : ModelRequest;
