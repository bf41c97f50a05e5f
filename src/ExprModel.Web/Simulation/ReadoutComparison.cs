namespace ExprModel.Web.Simulation;

/// <summary>A read-out whose value differs between two measurements of the same model.</summary>
public sealed record ReadoutChange(string Name, string Unit, double? Before, double? After);

/// <summary>Compares two read-out tables of the same model (the live table and the one a share link stored).</summary>
public static class ReadoutComparison
{
    /// <summary>
    /// Relative difference up to which two values count as equal. Both come from the same code on the same machine, so
    /// a real difference (another rheobase window, a read-out present in one and missing in the other) is far larger.
    /// </summary>
    public const double RelativeTolerance = 1e-9;

    /// <summary>The rows of <paramref name="after"/> whose value differs from the row of the same name in <paramref name="before"/>, in <paramref name="after"/>'s order.</summary>
    public static IReadOnlyList<ReadoutChange> Changes(IReadOnlyList<ReadoutRow> before, IReadOnlyList<ReadoutRow> after)
    {
        var old = new Dictionary<string, double?>(StringComparer.Ordinal);
        foreach (var r in before) old[r.Name] = r.Value;
        var changes = new List<ReadoutChange>();
        foreach (var r in after)
        {
            var was = old.GetValueOrDefault(r.Name);
            if (!Same(was, r.Value)) changes.Add(new ReadoutChange(r.Name, r.Unit, was, r.Value));
        }
        return changes;
    }

    private static bool Same(double? a, double? b) => (a, b) switch
    {
        (null, null) => true,
        ({ } x, { } y) => x.Equals(y) || Math.Abs(x - y) <= RelativeTolerance * Math.Max(Math.Abs(x), Math.Abs(y)),
        _ => false,
    };
}
