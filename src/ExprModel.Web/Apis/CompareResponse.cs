using ExprModel.Core.Confrontation;

namespace ExprModel.Web.Apis;

/// <param name="Csv">The same table as <c>exprmodel compare</c> writes (research caution first).</param>
public sealed record CompareResponse(IReadOnlyList<ReadoutMatch> Matches, string Per, string ExpressionNote, IReadOnlyList<ReadoutAgreement> Agreement,
    IReadOnlyList<GroupComparison> Groups, IReadOnlyList<CellComparison> Cells, IReadOnlyList<string> Warnings, string Csv, string Caution);
