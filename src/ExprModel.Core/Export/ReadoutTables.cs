namespace ExprModel.Core.Export;

/// <summary>
/// Compares two read-out tables of the same model, as <c>CellReadouts.Rows()</c> lists them (name, unit, value): a
/// stored table against one measured again (a share link's, a snapshot's). Values are equal when both are absent,
/// both NaN, or within a relative tolerance.
/// </summary>
public static class ReadoutTables
{
    /// <summary>
    /// Relative difference up to which two values count as equal when nothing else is asked for. Both come from the
    /// same code on the same machine, so a real difference (another rheobase window, a read-out present in one and
    /// missing in the other) is far larger than the last-digit differences of another order of operations.
    /// </summary>
    public const double RelativeTolerance = 1e-9;

    /// <summary>The rows of <paramref name="after"/> whose value differs from the row of the same name in <paramref name="before"/>, in
    /// <paramref name="after"/>'s order.</summary>
    public static IReadOnlyList<ReadoutChange> Changes(IEnumerable<(string Name, string Unit, double? Value)> before,
        IEnumerable<(string Name, string Unit, double? Value)> after, double relativeTolerance = RelativeTolerance)
    {
        var old = new Dictionary<string, double?>(StringComparer.Ordinal);
        foreach (var r in before) old[r.Name] = r.Value;
        var changes = new List<ReadoutChange>();
        foreach (var r in after)
        {
            var was = old.GetValueOrDefault(r.Name);
            if (!Same(was, r.Value, relativeTolerance)) changes.Add(new ReadoutChange(r.Name, r.Unit, was, r.Value));
        }
        return changes;
    }

    /// <summary>True when both tables list the same read-outs in the same order with the same values to the bit (NaN equals NaN).</summary>
    public static bool Identical(IReadOnlyList<(string Name, string Unit, double? Value)> before,
        IReadOnlyList<(string Name, string Unit, double? Value)> after) =>
        before.Count == after.Count && before.Zip(after).All(p => p.First.Name == p.Second.Name && Same(p.First.Value, p.Second.Value, 0));

    private static bool Same(double? a, double? b, double relativeTolerance) => (a, b) switch
    {
        (null, null) => true,
        ({ } x, { } y) => x.Equals(y) || Math.Abs(x - y) <= relativeTolerance * Math.Max(Math.Abs(x), Math.Abs(y)),
        _ => false,
    };
}
