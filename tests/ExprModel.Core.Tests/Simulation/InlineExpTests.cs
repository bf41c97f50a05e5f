using System.Runtime.Intrinsics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>The sweep kernel's inlined exp and log against the runtime's Math.Exp and Math.Log (the reference).</summary>
public class InlineExpTests
{
    /// <summary>Relative difference in units of double epsilon (2^-52).</summary>
    private static double Ulps(double got, double want) => Math.Abs(got - want) / (Math.Abs(want) * Math.Pow(2, -52));

    [SimdFact]
    public void Exp_matches_Math_Exp_to_two_ulp_over_the_kernels_range()
    {
        var rng = new Random(11);
        double worst = 0;
        var args = Enumerable.Range(0, 200_000).Select(_ => (rng.NextDouble() * 2 - 1) * (rng.Next(3) switch { 0 => 1, 1 => 40, _ => 700 }))
            .Concat([0.0, 1.0, -1.0, Math.Log(2), -Math.Log(2) / 2, Math.Log(2) / 2, 700, -700, 1e-12, -1e-12]).ToArray();
        for (int i = 0; i + 4 <= args.Length; i += 4)
        {
            var got = InlineExp.Exp(Vector256.Create(args[i], args[i + 1], args[i + 2], args[i + 3]));
            for (int l = 0; l < 4; l++) worst = Math.Max(worst, Ulps(got[l], Math.Exp(args[i + l])));
        }
        Assert.True(worst <= 2, $"largest difference from Math.Exp {worst:F2} ulp");
    }

    [SimdFact]
    public void Exp_is_clamped_not_broken_outside_the_range()
    {
        var got = InlineExp.Exp(Vector256.Create(-5000.0, -745.0, 800.0, 0.0));
        Assert.Equal(Math.Exp(-700), got[0], 1e-310);
        Assert.Equal(Math.Exp(-700), got[1], 1e-310);
        Assert.InRange(Ulps(got[2], Math.Exp(700)), 0, 2);
        Assert.Equal(1.0, got[3]);
    }

    [SimdFact]
    public void Log_matches_Math_Log_to_two_ulp_from_1e_minus_300_to_1e300()
    {
        var rng = new Random(12);
        double worst = 0, worstAbs = 0;
        var args = Enumerable.Range(0, 200_000).Select(_ => Math.Exp((rng.NextDouble() * 2 - 1) * (rng.Next(2) == 0 ? 2 : 690)))
            .Concat([1.0, 2.0, 0.5, Math.Sqrt(0.5), Math.Sqrt(2), 1 + 1e-15, 1 - 1e-16, 1e-300, 1e300, 2e-3, 1e-9, 1e-4, 1.0000001]).ToArray();
        while (args.Length % 4 != 0) args = [.. args, 3.0];
        for (int i = 0; i < args.Length; i += 4)
        {
            var got = InlineLog.Log(Vector256.Create(args[i], args[i + 1], args[i + 2], args[i + 3]));
            for (int l = 0; l < 4; l++)
            {
                double want = Math.Log(args[i + l]);
                if (want == 0) { worstAbs = Math.Max(worstAbs, Math.Abs(got[l])); continue; }
                worst = Math.Max(worst, Ulps(got[l], want));
            }
        }
        Assert.True(worst <= 2, $"largest difference from Math.Log {worst:F2} ulp");
        Assert.Equal(0, worstAbs);
    }
}
