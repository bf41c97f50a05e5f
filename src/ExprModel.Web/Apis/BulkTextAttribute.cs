namespace ExprModel.Web.Apis;

/// <summary>
/// A request field that carries a whole table or file (expression, metadata, recorded values, base64 recordings): exempt
/// from the per-field text limit, bounded by its route's body limit instead (<see cref="Hosting.RequestFieldLimits"/>).
/// </summary>
[AttributeUsage(AttributeTargets.Property)]
public sealed class BulkTextAttribute : Attribute;
