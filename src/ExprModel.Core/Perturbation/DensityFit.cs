using ExprModel.Core.Cell;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Fits relative densities to recorded read-outs under an expression prior (DOMAIN.md, "Fitting under an expression
/// prior"): minimise sum over targets ((predicted - recorded) / scale)^2 + sum over channels (ln(rel) / priorWidth)^2 over
/// ln(rel) of each fitted channel, bounded by the entry's plausible density range, from several seeded starting points.
/// rel is the channel's relative density in the model (1 = the density the file holds, derived from expression for built
/// models). Reproducible: the same model, targets and settings give the same result.
/// </summary>
public static class DensityFit
{
    /// <param name="model">The cell of <paramref name="doc"/> (same channels, same order).</param>
    /// <param name="progress">Called after each model evaluation, possibly from several threads.</param>
    public static FitResult Run(ModelDocument doc, CellModel model, IReadOnlyList<FitTarget> targets, FitSettings? settings = null,
        Action<FitProgress>? progress = null, CancellationToken cancel = default)
    {
        var s = settings ?? FitSettings.Default;
        if (s.Problem() is { } p) throw new ArgumentException("fit settings: " + p);
        if (targets.Count == 0) throw new ArgumentException("A fit needs at least one target read-out.");
        if (doc.Channels.Count != model.Channels.Count) throw new ArgumentException("The cell does not match the model document (channel count).");
        foreach (var dup in targets.GroupBy(t => t.Readout).Where(g => g.Count() > 1)) throw new ArgumentException($"target {dup.Key} is given twice.");
        var probe = DensityProbe.For(model, s.Readouts, targets.Select(t => t.Readout));
        var labels = probe.ChannelLabels;
        foreach (var f in s.FixedChannels) if (!labels.Contains(f)) throw new ArgumentException($"fixed channel '{f}' is not in the model (channels: " +
            $"{string.Join(", ", labels)}).");
        var fitted = Enumerable.Range(0, labels.Count).Where(k => model.Channels[k].EffectiveDensityMsPerCm2 > 0
            && !s.FixedChannels.Contains(labels[k])).ToArray();
        if (fitted.Length == 0) throw new ArgumentException("No channel is left to fit (all fixed or at zero density).");
        var (lower, upper) = Bounds(model, fitted, s.MaxFoldChange);
        var objective = new FitObjective(probe, targets, fitted, lower, upper, s.PriorWidth);
        var x0 = fitted.Select(k => objective.StartLn[k]).ToArray();

        var starts = StartingPoints(objective, x0, s);
        var results = new (double[] Point, double Cost, string Exit)[starts.Length];
        int startsDone = 0;
        void Report() => progress?.Invoke(new FitProgress(probe.Evaluations, Volatile.Read(ref startsDone), starts.Length, objective.BestCost));
        Parallel.For(0, starts.Length, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount, CancellationToken = cancel }, i =>
        {
            results[i] = FitOptimisers.Run(objective, starts[i], s, Report, cancel);
            Interlocked.Increment(ref startsDone);
            Report();
        });
        int bestStart = Enumerable.Range(0, results.Length).OrderBy(i => results[i].Cost).ThenBy(i => i).First();
        var xBest = results[bestStart].Point;

        var jacobian = ScaledJacobian(objective, xBest, SensitivitySettings.Default.StepLn, cancel);
        var fittedLabels = fitted.Select(k => labels[k]).ToArray();
        var ident = Identifiability.Analyse(jacobian, fittedLabels, s.PinnedWithinLn);
        var before = objective.Values(x0, cancel);
        var after = objective.Values(xBest, cancel);
        var residuals = targets.Select(t => new FitResidual(t.Readout, t.Unit, t.Value, t.Scale, before[t.Readout], after[t.Readout])).ToArray();
        var channels = Enumerable.Range(0, labels.Count).Select(k =>
        {
            int j = Array.IndexOf(fitted, k);
            double start = model.Channels[k].RelativeDensity;
            return j < 0
                ? new FitChannel(labels[k], start, start, start, start, true, false, double.NaN)
                : new FitChannel(labels[k], start, Math.Exp(xBest[j]), Math.Exp(lower[j]), Math.Exp(upper[j]), false, ident.Pinned[j], ident.DataSdLn[j]);
        }).ToArray();
        double costBefore = objective.Cost(x0, cancel), costAfter = objective.Cost(xBest, cancel);
        double misfitBefore = Rms(objective.TargetResiduals(x0, cancel)), misfitAfter = Rms(objective.TargetResiduals(xBest, cancel));
        var startRecords = results.Select((r, i) => new FitStart(i + 1, starts[i].Select(Math.Exp).ToArray(), r.Cost, r.Exit)).ToArray();
        var summary = FitReport.Summary(residuals, channels, misfitBefore, misfitAfter);
        var partial = new FitResult(doc, channels, residuals, ident, costBefore, costAfter, misfitBefore, misfitAfter, startRecords,
            probe.Evaluations, s, summary);
        return partial with { Document = FitReport.Document(doc, partial) };
    }

    /// <summary>
    /// Bounds of ln(rel) per fitted channel from the entry's plausible range, at most the fold change given, and always
    /// containing the start.
    /// </summary>
    private static (double[] Lower, double[] Upper) Bounds(CellModel model, int[] fitted, double maxFold)
    {
        double cap = Math.Log(maxFold);
        var lower = new double[fitted.Length];
        var upper = new double[fitted.Length];
        for (int j = 0; j < fitted.Length; j++)
        {
            var c = model.Channels[fitted[j]];
            double d = c.DensityMsPerCm2, x = Math.Log(c.RelativeDensity);
            double lo = c.Entry.MinDensityMsPerCm2 > 0 ? Math.Log(c.Entry.MinDensityMsPerCm2 / d) : -cap;
            double hi = c.Entry.MaxDensityMsPerCm2 > 0 ? Math.Log(c.Entry.MaxDensityMsPerCm2 / d) : cap;
            lower[j] = Math.Min(Math.Max(lo, -cap), x - 1e-3);
            upper[j] = Math.Max(Math.Min(hi, cap), x + 1e-3);
        }
        return (lower, upper);
    }

    /// <summary>Start 1 is the model itself; the others are drawn around it (normal in ln, seeded) and clamped into the bounds.</summary>
    private static double[][] StartingPoints(FitObjective objective, double[] x0, FitSettings s)
    {
        var rng = new Random(s.Seed);
        var starts = new double[s.Starts][];
        starts[0] = x0;
        for (int i = 1; i < s.Starts; i++)
        {
            var x = x0.Select(v => v + s.StartSpreadLn * Normal(rng)).ToArray();
            starts[i] = objective.Clamp(x);
        }
        return starts;
    }

    private static double Normal(Random rng) =>
        Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());

    /// <summary>d(scaled target residual) / d ln(density) by central differences (steps across several grid points), in parallel.</summary>
    private static double[,] ScaledJacobian(FitObjective objective, double[] x, double h, CancellationToken cancel)
    {
        int n = x.Length, m = objective.Targets.Count;
        var cols = new double[2 * n][];
        Simulator.ForEachItem(2 * n, cancel, v =>
        {
            var xv = (double[])x.Clone();
            xv[v / 2] += v % 2 == 0 ? -h : h;
            cols[v] = objective.TargetResiduals(xv, cancel);
        });
        var jac = new double[m, n];
        for (int j = 0; j < n; j++)
            for (int i = 0; i < m; i++) jac[i, j] = (cols[2 * j + 1][i] - cols[2 * j][i]) / (2 * h);
        return jac;
    }

    private static double Rms(double[] r) => r.Length == 0 ? 0 : Math.Sqrt(r.Sum(v => v * v) / r.Length);
}
