namespace ExprModel.Data.Catalog;

/// <summary>
/// Coverage of one gene group: how many of its genes are linked to kinetics of their own family. <paramref name="Unlinked"/>
/// lists the others, including <paramref name="ProxyOnly"/>: genes that feed another family's kinetics as a stand-in.
/// </summary>
public sealed record CoverageFigure(string Group, int Linked, int Total, IReadOnlyList<string> Unlinked, IReadOnlyList<string> ProxyOnly)
{
    public double Fraction => Total == 0 ? 1 : (double)Linked / Total;
}
