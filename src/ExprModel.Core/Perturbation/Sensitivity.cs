using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// The sensitivity matrix of a model: for each channel, the read-outs at ln(density) +- h (every other channel
/// unchanged), and per read-out the central difference (ln y+ - ln y-) / 2h, or (y+ - y-) / 2h for read-outs whose sign
/// can cross zero. When one side is undefined, the one-sided difference against the intact model is used and a note
/// says so. All 2 x channels variants run in parallel.
/// </summary>
public static class Sensitivity
{
    /// <param name="progress">Called with (variants done, variants in all).</param>
    public static SensitivityMatrix Run(CellModel model, SensitivitySettings? settings = null, Action<int, int>? progress = null,
        CancellationToken cancel = default)
    {
        var s = settings ?? SensitivitySettings.Default;
        if (s.Problem() is { } p) throw new ArgumentException("sensitivity settings: " + p);
        var probe = new DensityProbe(model, s.Readouts);
        var labels = probe.ChannelLabels;
        int n = probe.ChannelCount;
        // Variant 0 is the intact model; 1 + 2k and 2 + 2k are channel k down and up.
        var variants = new double[1 + 2 * n][];
        variants[0] = Enumerable.Repeat(1.0, n).ToArray();
        for (int k = 0; k < n; k++)
        {
            variants[1 + 2 * k] = variants[0].Select((_, j) => j == k ? Math.Exp(-s.StepLn) : 1.0).ToArray();
            variants[2 + 2 * k] = variants[0].Select((_, j) => j == k ? Math.Exp(s.StepLn) : 1.0).ToArray();
        }
        var results = new ReadoutValues[variants.Length];
        int done = 0;
        Simulator.ForEachItem(variants.Length, cancel, i =>
        {
            results[i] = probe.Measure(variants[i], cancel);
            progress?.Invoke(Interlocked.Increment(ref done), variants.Length);
        });
        var intact = results[0];
        if (intact.Failure is { } f) throw new ArgumentException("The intact model cannot be measured: " + f);

        var columns = ReadoutValues.Names.Where(r => ReadoutScales.KindOf(r.Name) != ElasticityKind.None)
            .Select(r => new SensitivityColumn(r.Name, r.Unit, ReadoutScales.KindOf(r.Name),
                ReadoutScales.Quantisation(r.Name, s.Readouts), s.Resolution(r.Name)))
            .ToArray();
        var notes = new List<string>
        {
            FormattableString.Invariant($"central differences at ln(density) +- {s.StepLn:0.###} (x{Math.Exp(-s.StepLn):0.###} and ") +
                FormattableString.Invariant($"x{Math.Exp(s.StepLn):0.###}), every other channel unchanged"),
            $"rheobase grid {ReadoutScales.Percent(s.Readouts.RheobaseRelativeTolerance)}, sustained-onset grid " +
                $"{ReadoutScales.Percent(s.Readouts.ClassRelativeTolerance)} (tightened for this run so each step moves them across several grid points)",
        };
        var values = new double?[n][];
        for (int k = 0; k < n; k++)
        {
            values[k] = new double?[columns.Length];
            var down = results[1 + 2 * k];
            var up = results[2 + 2 * k];
            if (down.Failure is { } fd) notes.Add(FormattableString.Invariant($"{labels[k]} x{Math.Exp(-s.StepLn):0.###}: {fd}"));
            if (up.Failure is { } fu) notes.Add(FormattableString.Invariant($"{labels[k]} x{Math.Exp(s.StepLn):0.###}: {fu}"));
            for (int j = 0; j < columns.Length; j++)
            {
                var c = columns[j];
                var (value, oneSided) = Difference(down[c.Readout], intact[c.Readout], up[c.Readout], s.StepLn, c.Kind);
                values[k][j] = value;
                if (oneSided) notes.Add($"{labels[k]} / {c.Readout}: undefined on one side of the difference; one-sided difference against the intact model.");
            }
        }
        return new SensitivityMatrix(labels, columns, values, s.StepLn, intact, notes);
    }

    /// <summary>The central difference, or a one-sided one when one side is missing (second item true).</summary>
    internal static (double? Value, bool OneSided) Difference(double? down, double? intact, double? up, double h, ElasticityKind kind)
    {
        double? T(double? y) => y is not { } v ? null : kind == ElasticityKind.PerLogDensity ? v : v > 0 ? Math.Log(v) : null;
        var (a, b, c) = (T(down), T(intact), T(up));
        if (a is { } lo && c is { } hi) return ((hi - lo) / (2 * h), false);
        if (b is { } mid && c is { } hi2) return ((hi2 - mid) / h, true);
        if (a is { } lo2 && b is { } mid2) return ((mid2 - lo2) / h, true);
        return (null, false);
    }
}
