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
    public Verification Verification { get; init; } = Verification.Recalled;

    public string Short => $"{Authors} {Year}, {Journal} {Volume}:{Pages}".TrimEnd(':', ' ');
}
