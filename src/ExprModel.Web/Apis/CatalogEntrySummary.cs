namespace ExprModel.Web.Apis;

/// <summary>
/// One entry in the catalog list. <c>Verification</c> says whether the parameters were checked against the paper or recalled;
/// <c>CitationCheck</c> (unchecked, confirmed, not-found) whether the citation was compared with the paper's abstract page at
/// <c>CitationCheckedAt</c>. <c>Genes</c> lists every linked symbol; <c>GeneLinks</c> says which of them are proxies and why.
/// </summary>
public sealed record CatalogEntrySummary(string Id, int Version, string Name, string Family, string Ion, IReadOnlyList<string> Genes,
    string Citation, string Doi, string Verification, double ReferenceTemperatureC, double Q10, double TypicalDensityMsPerCm2,
    string CitationCheck, string CitationCheckedAt, string CitationNote, IReadOnlyList<CatalogGeneLink> GeneLinks);
