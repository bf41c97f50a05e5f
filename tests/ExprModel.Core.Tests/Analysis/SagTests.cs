using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>Sag ratio on sampled traces (identities of the definition (steady - lowest) / (rest - lowest)).</summary>
public sealed class SagTests
{
    private const double Dt = 0.025, Rest = -70, OnsetMs = 100, StepMs = 1000;

    private static double[] Trace(Func<double, double> duringStep)
    {
        var v = new double[(int)Math.Round((OnsetMs + StepMs) / Dt) + 1];
        for (int i = 0; i < v.Length; i++)
        {
            double t = i * Dt - OnsetMs;
            v[i] = t < 0 ? Rest : duringStep(t);
        }
        return v;
    }

    [Fact]
    public void A_response_that_falls_to_minus_95_and_settles_at_minus_90_has_a_sag_of_one_fifth()
    {
        // Down to -95 mV within 50 ms, then an exponential recovery (tau 20 ms) to -90 mV: (-90 - -95) / (-70 - -95) = 0.2.
        var v = Trace(t => t < 50 ? Rest - 25 * t / 50 : -90 - 5 * Math.Exp(-(t - 50) / 20));
        Assert.Equal(0.2, Sag.Ratio(v, Dt, OnsetMs, StepMs, Rest), 1e-6);
    }

    [Fact]
    public void A_response_without_recovery_has_no_sag()
    {
        var flatBelow = Trace(t => Rest - 25 * (1 - Math.Exp(-t / 20)));
        Assert.Equal(0, Sag.Ratio(flatBelow, Dt, OnsetMs, StepMs, Rest), 1e-6);
        // No deflection below rest at all: 0 by definition.
        Assert.Equal(0, Sag.Ratio(Trace(_ => Rest), Dt, OnsetMs, StepMs, Rest));
    }
}
