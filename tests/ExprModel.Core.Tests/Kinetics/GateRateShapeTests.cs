using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

public class GateRateShapeTests
{
    [Fact]
    public void Offset_sigmoid_is_base_plus_half_amplitude_at_v0()
    {
        // Golomb et al. 2007 tau_h = 0.5 + 14/(1 + exp((V + 60)/12)): 7.5 ms at -60 mV, 0.5 ms floor when depolarised.
        var r = GateRate.OffsetSigmoid(0.5, 14, -60, 12);
        Assert.Equal(7.5, r.Evaluate(-60), 12);
        Assert.Equal(0.5, r.Evaluate(200), 6);
        Assert.Equal(14.5, r.Evaluate(-400), 6);
        Assert.Equal("k must not be zero", GateRate.OffsetSigmoid(0, 1, 0, 0).Problem());
    }

    [Fact]
    public void Inverse_rate_sum_is_the_reciprocal_of_two_linear_over_exponential_rates()
    {
        // Mainen et al. 1995 h gate: tau_h = 1/(alpha_h + beta_h), alpha_h = 0.024 (V+50)/(1 - exp(-(V+50)/5)),
        // beta_h = -0.0091 (V+75)/(1 - exp((V+75)/5)).
        var r = GateRate.InverseRateSum(0.024, -50, 5, -0.0091, -75, -5);
        foreach (var v in new[] { -100.0, -75, -60, -50, -20, 30 })
        {
            double a = GateRate.LinearOverExponential(0.024, -50, 5).Evaluate(v);
            double b = GateRate.LinearOverExponential(-0.0091, -75, -5).Evaluate(v);
            Assert.Equal(1 / (a + b), r.Evaluate(v), 12);
        }
        // At -75 mV beta_h takes its limit -0.0091 x -5 = 0.0455/ms.
        double aAt = 0.024 * -25 / (1 - Math.Exp(5));
        Assert.Equal(1 / (aAt + 0.0455), r.Evaluate(-75), 9);
        Assert.NotNull(GateRate.InverseRateSum(1, 0, 1, 1, 0, 0).Problem());
    }

    [Fact]
    public void Calcium_bound_rates_follow_moczydlowski_and_latorre_1983()
    {
        // alpha = A/(1 + K(V)/[Ca]) and beta = A/(1 + [Ca]/K(V)), K(V) = K(0) exp(-V/k): each is A/2 where [Ca] = K(V).
        var open = GateRate.CalciumBoundOpening(0.48, 0.18, 15);
        var close = GateRate.CalciumBoundClosing(0.28, 0.011, 12.7);
        Assert.Equal(0.24, open.Evaluate(0, 0.18), 12);
        Assert.Equal(0.24, open.Evaluate(30, 0.18 * Math.Exp(-2)), 12);
        Assert.Equal(0.14, close.Evaluate(0, 0.011), 12);
        Assert.True(open.DependsOnCalcium && close.DependsOnCalcium);
        Assert.False(GateRate.Boltzmann(-40, 5).DependsOnCalcium);
        // Without a calcium argument they use resting calcium (50 nM).
        Assert.Equal(open.Evaluate(10, GateRate.RestingCalciumMm), open.Evaluate(10), 15);
        Assert.NotNull(GateRate.CalciumBoundOpening(0.48, 0, 15).Problem());
    }
}
