using ExprModel.Core.Perturbation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The tornado plot of one read-out: a bar per knocked-down target, largest effect first, left for a decrease and
/// right for an increase. Read-outs that keep one sign are shown as relative change (%), potentials and indices whose sign
/// can cross zero as change in their own unit (the library's <see cref="ReadoutScales.KindOf"/>).
/// </summary>
public sealed record TornadoChart(string Readout, string Unit, bool Relative, IReadOnlyList<TornadoBar> Bars, int Hidden)
{
    public string AxisLabel => Relative ? $"change of {Readout} (%)" : $"change of {Readout} ({Unit})";

    /// <param name="ranked">The read-out's changes, largest effect first (<see cref="KnockdownReport.Ranked"/>).</param>
    /// <param name="most">Bars drawn at most; the rest are counted in <see cref="Hidden"/>.</param>
    public static TornadoChart From(IReadOnlyList<KnockdownChange> ranked, string readout, int most)
    {
        bool relative = ReadoutScales.KindOf(readout) == ElasticityKind.LogRatio;
        var bars = ranked.Take(most).Select(c => new TornadoBar(c.Target, relative ? c.RelativeChange * 100 : c.Change, c.Lost, c.Gained, c.Intact,
            c.KnockedDown)).ToArray();
        return new TornadoChart(readout, ReadoutValues.UnitOf(readout) ?? "", relative, bars, Math.Max(0, ranked.Count - most));
    }

    /// <summary>Half-width of the value axis: the largest bar, with room for the bars of lost and gained read-outs drawn at its edge.</summary>
    public double AxisHalfWidth
    {
        get
        {
            double most = Bars.Select(b => Math.Abs(b.Value ?? 0)).DefaultIfEmpty(0).Max();
            return most > 0 ? most * 1.15 : Relative ? 10 : 1;
        }
    }
}
