using ExprModel.Core.Models;

namespace ExprModel.Core.Mapping;

/// <summary>A model built from expression, with the derivation of every density and the warnings a user should read.</summary>
public sealed record BuiltModel(ModelDocument Document, IReadOnlyList<DensityDerivation> Densities, IReadOnlyList<string> Warnings);
