using System.Text.Json;
using ExprModel.Core.Mapping;

namespace ExprModel.Web.Apis;

public sealed record BuildResponse(JsonElement Model, IReadOnlyList<DensityDerivation> Densities, IReadOnlyList<string> Warnings,
    IReadOnlyList<UnmappedChannelGene> Unmapped, IReadOnlyList<string> Problems, string Caution);
