using ExprModel.Core.Simulation;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.Optimization;
using MathNet.Numerics;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// One start of a fit with either MathNet.Numerics optimiser. Each keeps the best point it evaluated, so a start that
/// runs out of its evaluation budget still returns its best.
/// </summary>
internal static class FitOptimisers
{
    public static (double[] Point, double Cost, string Exit) Run(FitObjective objective, double[] start, FitSettings s, Action onEvaluation,
        CancellationToken cancel)
    {
        double[] best = start;
        double bestCost = double.PositiveInfinity;
        var gate = new object();
        double[] Residuals(IReadOnlyList<double> x)
        {
            var r = objective.Residuals(x, cancel);
            double c = r.Sum(v => v * v);
            lock (gate) if (c < bestCost) { bestCost = c; best = x.ToArray(); }
            onEvaluation();
            return r;
        }
        string exit = s.Optimiser == FitOptimiser.Simplex ? Simplex(objective, start, s, Residuals) : LevenbergMarquardt(objective, start, s, Residuals);
        return (best, bestCost, exit);
    }

    private static string Simplex(FitObjective objective, double[] start, FitSettings s, Func<IReadOnlyList<double>, double[]> residuals)
    {
        // Nelder-Mead is unbounded: evaluate at the point clamped into the bounds and add a steep penalty on the excess,
        // so the simplex is pushed back without ever simulating outside the plausible range.
        double Cost(Vector<double> x)
        {
            var inside = objective.Clamp(x.ToArray());
            double excess = 0;
            for (int j = 0; j < x.Count; j++) excess += (x[j] - inside[j]) * (x[j] - inside[j]);
            return residuals(inside).Sum(v => v * v) + 100 * excess;
        }
        try
        {
            var r = NelderMeadSimplex.Minimum(ObjectiveFunction.Value(Cost), Vector<double>.Build.DenseOfArray(start),
                Vector<double>.Build.Dense(start.Length, 2 * s.JacobianStepLn), 1e-4, s.MaxEvaluationsPerStart);
            return $"simplex: {r.ReasonForExit} after {r.Iterations} evaluations";
        }
        catch (MaximumIterationsException)
        {
            return $"simplex: evaluation budget ({s.MaxEvaluationsPerStart}) used up";
        }
    }

    private static string LevenbergMarquardt(FitObjective objective, double[] start, FitSettings s, Func<IReadOnlyList<double>, double[]> residuals)
    {
        int m = objective.ResidualCount, n = start.Length;
        int t = objective.Targets.Count;
        // The model value f = r + y with y the scaled recordings (and 0 for the prior rows), so that y - f = -r.
        var y = Vector<double>.Build.Dense(m, i => i < t ? objective.Targets[i].Value / objective.Targets[i].Scale : 0);
        Vector<double> F(Vector<double> p) => Vector<double>.Build.DenseOfArray(residuals(p.ToArray())) + y;
        Matrix<double> J(Vector<double> p)
        {
            var x = p.ToArray();
            var f0 = residuals(x);
            var columns = new double[n][];
            // Forward differences in ln(density), stepping across many grid points of the onset searches; inward at an upper bound.
            Simulator.ForEachItem(n, default, j =>
            {
                double h = x[j] + s.JacobianStepLn <= objective.Upper[j] ? s.JacobianStepLn : -s.JacobianStepLn;
                var xj = (double[])x.Clone();
                xj[j] += h;
                var fj = residuals(xj);
                columns[j] = fj.Select((v, i) => (v - f0[i]) / h).ToArray();
            });
            return Matrix<double>.Build.Dense(m, n, (i, j) => columns[j][i]);
        }
        var model = ObjectiveFunction.NonlinearModel((p, _) => F(p), (p, _) => J(p), Vector<double>.Build.Dense(m, i => i), y);
        // Each iteration costs a Jacobian (n evaluations) and at least one trial point.
        int iterations = Math.Max(2, s.MaxEvaluationsPerStart / (n + 2));
        var lm = new LevenbergMarquardtMinimizer(initialMu: 1e-3, gradientTolerance: 1e-6, stepTolerance: 1e-3, functionTolerance: 1e-6,
            maximumIterations: iterations);
        try
        {
            var r = lm.FindMinimum(model, Vector<double>.Build.DenseOfArray(start),
                Vector<double>.Build.DenseOfArray(objective.Lower), Vector<double>.Build.DenseOfArray(objective.Upper));
            return $"levenberg-marquardt: {r.ReasonForExit} after {r.Iterations} iterations";
        }
        catch (Exception e) when (e is MaximumIterationsException or NonConvergenceException)
        {
            return $"levenberg-marquardt: stopped ({e.Message})";
        }
    }
}
