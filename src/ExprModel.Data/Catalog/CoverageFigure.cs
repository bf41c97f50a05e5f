namespace ExprModel.Data.Catalog;

/// <summary>Coverage of one gene group: how many of its genes are linked to entries.</summary>
public sealed record CoverageFigure(string Group, int Linked, int Total, IReadOnlyList<string> Unlinked)
{
    public double Fraction => Total == 0 ? 1 : (double)Linked / Total;
}
