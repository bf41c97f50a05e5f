namespace ExprModel.Core.Kinetics;

/// <summary>
/// Whether an entry's citation (authors, year, title, journal, volume, pages, DOI) was compared with the paper's PubMed or
/// journal abstract page. Separate from <see cref="Verification"/>, which says whether the parameters were read from the paper.
/// </summary>
public enum CitationCheck
{
    /// <summary>Not yet compared with an abstract page.</summary>
    Unchecked,
    /// <summary>Every field agrees with the abstract page named in <see cref="Citation.CitationCheckedAt"/>.</summary>
    Confirmed,
    /// <summary>No abstract page of the paper could be found; <see cref="Citation.CitationNote"/> says what was searched.</summary>
    NotFound,
}
