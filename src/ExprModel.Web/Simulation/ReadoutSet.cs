namespace ExprModel.Web.Simulation;

/// <summary>All read-outs of one model with the extractor's notes (why a read-out is missing, for example).</summary>
public sealed record ReadoutSet(IReadOnlyList<ReadoutRow> Rows, IReadOnlyList<string> Notes)
{
    /// <summary>The f-I curve the read-outs were measured on (the library's standard sweep, 0 to 3x rheobase).</summary>
    public IReadOnlyList<FiRow> Fi { get; init; } = [];

    /// <summary>Names of read-outs still being measured (a first stage shown early); empty when the set is complete.</summary>
    public IReadOnlySet<string> Pending { get; init; } = EmptyNames;
    public bool IsComplete => Pending.Count == 0;

    /// <summary>The library's first-stage result and compiled cell, kept so the second stage can continue from it.</summary>
    internal (ExprModel.Core.Simulation.CompiledCell Cell, ExprModel.Core.Analysis.CellReadouts Stage)? Continuation { get; init; }

    /// <summary>Where the next similar model's rheobase search starts (see <see cref="ExprModel.Core.Analysis.RheobaseHint"/>).</summary>
    public ExprModel.Core.Analysis.RheobaseHint? Hint { get; init; }

    /// <summary>The rheobase search saw spiking stop and start again with the step amplitude; such a cell gives no <see cref="Hint"/>.</summary>
    public bool SpikingNotMonotone { get; init; }

    private static readonly IReadOnlySet<string> EmptyNames = new HashSet<string>();

    public double? Value(string name) => Rows.FirstOrDefault(r => r.Name == name)?.Value;
}
