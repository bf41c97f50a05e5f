using MathNet.Numerics.LinearAlgebra;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Identifiability from the singular value decomposition of the scaled sensitivity matrix J = U S V^T (MathNet.Numerics):
/// moving ln(density) by one unit along right singular vector k changes the scaled misfit by s_k, so the data alone fix
/// that direction to about 1 / s_k (the linearised least-squares covariance (J^T J)^-1 = V S^-2 V^T). A direction with
/// 1 / s_k above the threshold, or beyond the number of targets (s = 0), is left free by the data.
/// </summary>
public static class Identifiability
{
    public static IdentifiabilityReport Analyse(double[,] scaledJacobian, IReadOnlyList<string> channels, double pinnedWithinLn)
    {
        int n = scaledJacobian.GetLength(1);
        if (n != channels.Count) throw new ArgumentException($"{n} columns for {channels.Count} channels.");
        var svd = Matrix<double>.Build.DenseOfArray(scaledJacobian).Svd(true);
        var vt = svd.VT;
        var s = Enumerable.Range(0, n).Select(k => k < svd.S.Count ? svd.S[k] : 0.0).ToArray();
        double threshold = 1 / pinnedWithinLn;
        var pinnedDirection = s.Select(v => v >= threshold).ToArray();
        var directions = Enumerable.Range(0, n).Select(k => Describe(vt.Row(k), channels)).ToArray();
        var sd = new double[n];
        for (int j = 0; j < n; j++)
        {
            double var = 0;
            for (int k = 0; k < n; k++)
            {
                double w = vt[k, j] * vt[k, j];
                if (w < 1e-6) continue;
                var += s[k] > 1e-12 ? w / (s[k] * s[k]) : double.PositiveInfinity;
            }
            sd[j] = Math.Sqrt(var);
        }
        return new IdentifiabilityReport(channels, s, directions, pinnedDirection, sd, sd.Select(v => v <= pinnedWithinLn).ToArray(), pinnedWithinLn);
    }

    /// <summary>"+0.91 kv7-m -0.40 leak": the components above 0.3 in size, largest first.</summary>
    private static string Describe(Vector<double> v, IReadOnlyList<string> channels)
    {
        // A singular vector's sign is arbitrary: show it with its largest component positive.
        int top = v.AbsoluteMaximumIndex();
        double sign = v[top] < 0 ? -1 : 1;
        var parts = Enumerable.Range(0, v.Count).Where(j => Math.Abs(v[j]) >= 0.3).OrderByDescending(j => Math.Abs(v[j]))
            .Select(j => $"{sign * v[j]:+0.00;-0.00} {channels[j]}");
        return string.Join(" ", parts);
    }
}
