namespace ExprModel.Web.Apis;

/// <summary>The methods paragraph, the BibTeX file's text and the research-use caution.</summary>
public sealed record MethodsResponse(string Methods, string BibTex, string Caution);
