using System.Text.Json;
using ExprModel.Core.Mapping;

namespace ExprModel.Web.Apis;

/// <summary>A model built from expression. <c>Proxies</c>: genes that fed another family's kinetics as a stand-in, with the reason.</summary>
public sealed record BuildResponse(JsonElement Model, IReadOnlyList<DensityDerivation> Densities, IReadOnlyList<string> Warnings,
    IReadOnlyList<UnmappedChannelGene> Unmapped, IReadOnlyList<string> Problems, string Caution, IReadOnlyList<ProxyLink> Proxies);
