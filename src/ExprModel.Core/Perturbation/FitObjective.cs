using System.Collections.Concurrent;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// The fit's residual vector at a point x (ln relative density of each fitted channel): first
/// (predicted - recorded) / scale for each target, then x / priorWidth for each channel when there is a prior, so the
/// objective is their sum of squares (DOMAIN.md, "Fitting under an expression prior"). A target the variant does not
/// define (no spike, a failed run) counts as <see cref="MissingResidual"/> scales off. Evaluations are cached by point
/// and the best point seen is kept, so an optimiser stopped by its budget still returns its best.
/// </summary>
internal sealed class FitObjective
{
    /// <summary>Residual (in scales) of a target the model variant leaves undefined: far worse than any defined miss we expect.</summary>
    public const double MissingResidual = 10;

    private readonly ConcurrentDictionary<string, (ReadoutValues Values, double[] Residuals)> _cache = new();
    private readonly object _bestLock = new();

    public FitObjective(DensityProbe probe, IReadOnlyList<FitTarget> targets, int[] fitted, double[] lower, double[] upper, double? priorWidth)
    {
        Probe = probe;
        Targets = targets;
        Fitted = fitted;
        Lower = lower;
        Upper = upper;
        PriorWidth = priorWidth;
        StartLn = probe.Model.Channels.Select(c => Math.Log(c.RelativeDensity)).ToArray();
    }

    public DensityProbe Probe { get; }
    public IReadOnlyList<FitTarget> Targets { get; }
    /// <summary>Model channel index of each fitted parameter.</summary>
    public int[] Fitted { get; }
    public double[] Lower { get; }
    public double[] Upper { get; }
    public double? PriorWidth { get; }
    /// <summary>ln relative density of every channel of the model as given.</summary>
    public double[] StartLn { get; }
    public int ResidualCount => Targets.Count + (PriorWidth is null ? 0 : Fitted.Length);
    public double[]? Best { get; private set; }
    public double BestCost { get; private set; } = double.PositiveInfinity;

    /// <summary>x clamped into the bounds.</summary>
    public double[] Clamp(IReadOnlyList<double> x) => x.Select((v, j) => Math.Clamp(v, Lower[j], Upper[j])).ToArray();

    /// <summary>The density factor on every model channel for the point x.</summary>
    public double[] Factors(IReadOnlyList<double> x)
    {
        var f = Enumerable.Repeat(1.0, StartLn.Length).ToArray();
        for (int j = 0; j < Fitted.Length; j++) f[Fitted[j]] = Math.Exp(x[j] - StartLn[Fitted[j]]);
        return f;
    }

    public ReadoutValues Values(IReadOnlyList<double> x, CancellationToken cancel) => Evaluate(x, cancel).Values;

    public double[] Residuals(IReadOnlyList<double> x, CancellationToken cancel) => Evaluate(x, cancel).Residuals;

    public double Cost(IReadOnlyList<double> x, CancellationToken cancel) => Residuals(x, cancel).Sum(r => r * r);

    /// <summary>The target residuals alone (no prior rows), for the identifiability analysis.</summary>
    public double[] TargetResiduals(IReadOnlyList<double> x, CancellationToken cancel) => Residuals(x, cancel).Take(Targets.Count).ToArray();

    private (ReadoutValues Values, double[] Residuals) Evaluate(IReadOnlyList<double> x, CancellationToken cancel)
    {
        cancel.ThrowIfCancellationRequested();
        var key = string.Join(",", x.Select(v => v.ToString("R", System.Globalization.CultureInfo.InvariantCulture)));
        if (_cache.TryGetValue(key, out var hit)) return hit;
        var values = Probe.Measure(Factors(x), cancel);
        var r = new double[ResidualCount];
        for (int i = 0; i < Targets.Count; i++)
        {
            var t = Targets[i];
            r[i] = values[t.Readout] is { } p ? (p - t.Value) / t.Scale : MissingResidual;
        }
        if (PriorWidth is { } w) for (int j = 0; j < Fitted.Length; j++) r[Targets.Count + j] = x[j] / w;
        double cost = r.Sum(v => v * v);
        lock (_bestLock)
        {
            if (cost < BestCost) { BestCost = cost; Best = x.ToArray(); }
        }
        _cache[key] = (values, r);
        return (values, r);
    }
}
