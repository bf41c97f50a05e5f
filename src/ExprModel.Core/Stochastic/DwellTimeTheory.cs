using MathNet.Numerics.LinearAlgebra;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// Dwell-time densities of a Markov scheme with one open state at fixed voltage. Open times are exponential with the
/// total rate of leaving the open state. Closed times, for the stationary chain, have the density
/// f(t) = phi exp(Q_CC t) q_CO, where Q_CC is the generator restricted to the closed states, q_CO the rates into the
/// open state and phi the closed state entered on closing (proportional to the rates out of the open state): a sum of
/// exponentials with the eigenvalues of Q_CC (Colquhoun &amp; Hawkes 1981, Proc R Soc Lond B 211:205; from memory).
/// </summary>
public sealed record DwellTimeTheory
{
    /// <summary>Rate (1/ms) of leaving the open state; the mean open time is its inverse.</summary>
    public required double OpenExitRate { get; init; }
    /// <summary>Closed-time density as amplitudes a_k and rates lambda_k: f(t) = sum a_k exp(-lambda_k t).</summary>
    public required IReadOnlyList<(double Amplitude, double RatePerMs)> ClosedComponents { get; init; }

    public double MeanOpenMs => 1 / OpenExitRate;

    /// <summary>Mean closed time: sum a_k / lambda_k^2.</summary>
    public double MeanClosedMs => ClosedComponents.Sum(c => c.Amplitude / (c.RatePerMs * c.RatePerMs));

    public double OpenDensity(double tMs) => tMs < 0 ? 0 : OpenExitRate * Math.Exp(-OpenExitRate * tMs);

    public double ClosedDensity(double tMs) => tMs < 0 ? 0 : ClosedComponents.Sum(c => c.Amplitude * Math.Exp(-c.RatePerMs * tMs));

    /// <summary>The theory of <paramref name="scheme"/> with per-kinetic-gate rates alpha and beta (1/ms).</summary>
    public static DwellTimeTheory For(MarkovScheme scheme, ReadOnlySpan<double> alpha, ReadOnlySpan<double> beta)
    {
        int n = scheme.StateCount, open = scheme.OpenState;
        var (targets, rates) = scheme.NewTransitionTables();
        scheme.Transitions(alpha, beta, targets, rates);
        double openExit = scheme.ExitRate(open, alpha, beta);
        if (n == 1) return new DwellTimeTheory { OpenExitRate = openExit, ClosedComponents = [] };
        var closed = Enumerable.Range(0, n).Where(s => s != open).ToArray();
        var index = new int[n];
        for (int i = 0; i < closed.Length; i++) index[closed[i]] = i;
        var q = Matrix<double>.Build.Dense(closed.Length, closed.Length);
        var toOpen = Vector<double>.Build.Dense(closed.Length);
        var entry = Vector<double>.Build.Dense(closed.Length);
        for (int i = 0; i < closed.Length; i++)
        {
            int s = closed[i];
            q[i, i] = -scheme.ExitRate(s, alpha, beta);
            for (int t = 0; t < targets[s].Length; t++)
            {
                if (rates[s][t] == 0) continue;
                int to = targets[s][t];
                if (to == open) toOpen[i] += rates[s][t];
                else q[i, index[to]] += rates[s][t];
            }
        }
        for (int t = 0; t < targets[open].Length; t++)
            if (rates[open][t] > 0) entry[index[targets[open][t]]] += rates[open][t] / openExit;
        var evd = q.Evd();
        var vectors = evd.EigenVectors;
        var left = entry * vectors;
        var right = vectors.Inverse() * toOpen;
        var components = new List<(double, double)>();
        for (int k = 0; k < closed.Length; k++)
        {
            double amplitude = left[k] * right[k];
            double lambda = -evd.EigenValues[k].Real;
            if (Math.Abs(amplitude) > 1e-300 && lambda > 0) components.Add((amplitude, lambda));
        }
        return new DwellTimeTheory { OpenExitRate = openExit, ClosedComponents = components };
    }
}
