using ExprModel.Core.Analysis;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// The scalar read-outs of one model variant by name (as in <see cref="CellReadouts.Rows"/>), or why it could not be
/// measured (a run that left the physical range, a model that cannot be compiled).
/// </summary>
public sealed record ReadoutValues(IReadOnlyDictionary<string, double?> Values, string? Failure = null)
{
    /// <summary>The value of read-out <paramref name="name"/>, null when not defined, not measured or the run failed.</summary>
    public double? this[string name] => Values.TryGetValue(name, out var v) ? v : null;

    public static ReadoutValues From(CellReadouts r) =>
        new(r.Rows().ToDictionary(x => x.Name, x => x.Value, StringComparer.Ordinal));

    public static ReadoutValues Failed(string why) => new(new Dictionary<string, double?>(StringComparer.Ordinal), why);

    /// <summary>Every read-out name with its unit, in the extractor's order.</summary>
    public static IReadOnlyList<(string Name, string Unit)> Names { get; } = new CellReadouts().Rows().Select(r => (r.Name, r.Unit)).ToArray();

    /// <summary>The unit of read-out <paramref name="name"/>, null for a name the extractor does not produce.</summary>
    public static string? UnitOf(string name) => Names.FirstOrDefault(n => n.Name == name).Unit;
}
