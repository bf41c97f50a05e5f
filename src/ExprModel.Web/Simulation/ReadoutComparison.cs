using ExprModel.Core.Export;

namespace ExprModel.Web.Simulation;

/// <summary>The library's read-out table comparison (<see cref="ReadoutTables"/>) on the web's rows.</summary>
public static class ReadoutComparison
{
    /// <summary>The rows of <paramref name="after"/> whose value differs from the row of the same name in <paramref name="before"/>, in
    /// <paramref name="after"/>'s order.</summary>
    public static IReadOnlyList<ReadoutChange> Changes(IReadOnlyList<ReadoutRow> before, IReadOnlyList<ReadoutRow> after) =>
        ReadoutTables.Changes(Rows(before), Rows(after));

    /// <summary>True when both tables hold the same read-outs in the same order with the same values to the bit.</summary>
    public static bool Identical(IReadOnlyList<ReadoutRow> before, IReadOnlyList<ReadoutRow> after) =>
        ReadoutTables.Identical(Rows(before), Rows(after));

    private static (string Name, string Unit, double? Value)[] Rows(IReadOnlyList<ReadoutRow> rows) => rows.Select(r => (r.Name, r.Unit, r.Value)).ToArray();
}
