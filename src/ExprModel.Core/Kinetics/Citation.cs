namespace ExprModel.Core.Kinetics;

/// <summary>Where an entry's numbers come from.</summary>
public sealed record Citation
{
    public required string Authors { get; init; }
    public required int Year { get; init; }
    public string Title { get; init; } = "";
    public required string Journal { get; init; }
    public string Volume { get; init; } = "";
    public string Pages { get; init; } = "";
    public string Doi { get; init; } = "";
    /// <summary>The table, figure or equations the parameters come from.</summary>
    public string Location { get; init; } = "";
    /// <summary>Whether the parameters were read from the paper (checked) or recalled.</summary>
    public Verification Verification { get; init; } = Verification.Recalled;
    /// <summary>Whether the citation itself was compared with the paper's abstract page (separate from the parameters).</summary>
    public CitationCheck CitationCheck { get; init; } = CitationCheck.Unchecked;
    /// <summary>Address of the PubMed or journal abstract page the citation was compared with ("" when none).</summary>
    public string CitationCheckedAt { get; init; } = "";
    /// <summary>What the comparison found or why no page was found.</summary>
    public string CitationNote { get; init; } = "";

    public string Short => $"{Authors} {Year}, {Journal} {Volume}:{Pages}".TrimEnd(':', ' ');
}
