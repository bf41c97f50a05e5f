namespace ExprModel.Core.Export;

/// <summary>A read-out whose value differs between two measurements of the same model (null: absent or not measured).</summary>
public sealed record ReadoutChange(string Name, string Unit, double? Before, double? After);
