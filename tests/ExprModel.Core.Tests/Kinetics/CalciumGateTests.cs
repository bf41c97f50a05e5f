using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

public class CalciumGateTests
{
    private static GateSpec BkGate() => new()
    {
        Name = "o",
        Kind = GateKind.Calcium,
        Alpha = GateRate.CalciumBoundOpening(0.48, 0.18, 15.14),
        Beta = GateRate.CalciumBoundClosing(0.28, 0.011, 12.72),
    };

    [Fact]
    public void Bk_gate_steady_state_and_time_constant_come_from_its_calcium_and_voltage_dependent_rates()
    {
        var g = BkGate();
        Assert.Null(g.Problem());
        Assert.True(g.DependsOnCalcium);
        foreach (var (v, ca) in new[] { (-40.0, 1e-4), (0.0, 1e-3), (40.0, 1e-2) })
        {
            double a = g.Alpha!.Evaluate(v, ca), b = g.Beta!.Evaluate(v, ca);
            Assert.Equal(a / (a + b), g.SteadyStateAt(v, ca), 12);
            Assert.Equal(1 / (a + b), g.TimeConstantAt(v, ca), 12);
        }
        // The voltage-only overload uses resting calcium.
        Assert.Equal(g.TimeConstantAt(0, GateRate.RestingCalciumMm), g.TimeConstantAt(0), 12);
        // Moczydlowski & Latorre 1983: open probability rises with both calcium and depolarisation.
        Assert.True(g.SteadyStateAt(0, 1e-2) > g.SteadyStateAt(0, 1e-3));
        Assert.True(g.SteadyStateAt(30, 1e-3) > g.SteadyStateAt(-30, 1e-3));
    }

    [Fact]
    public void Hill_calcium_gate_is_unchanged_half_open_at_its_half_activation()
    {
        var g = new GateSpec { Name = "q", Kind = GateKind.Calcium, Calcium = new CalciumSensitivity(6.3e-4, 4, 5) };
        Assert.Equal(0.5, g.SteadyStateAt(-50, 6.3e-4), 12);
        Assert.Equal(5, g.TimeConstantAt(0), 12);
        Assert.Equal(5, g.TimeConstantAt(0, 1e-2), 12);
    }

    [Fact]
    public void A_calcium_gate_without_a_sensitivity_needs_both_rates()
    {
        var onlyAlpha = BkGate() with { Beta = null };
        Assert.Contains("alpha and beta", onlyAlpha.Problem());
        var none = new GateSpec { Name = "x", Kind = GateKind.Calcium };
        Assert.Contains("calcium sensitivity is required", none.Problem());
    }

    [Fact]
    public void Voltage_gates_ignore_the_calcium_argument()
    {
        var g = new GateSpec
        {
            Name = "n",
            Kind = GateKind.SteadyStateAndTau,
            SteadyState = GateRate.Boltzmann(-39, 5),
            TimeConstantMs = GateRate.Constant(75)
        };
        Assert.Equal(g.TimeConstantAt(-20), g.TimeConstantAt(-20, 1e-2));
        Assert.False(g.DependsOnCalcium);
    }

    [Fact]
    public void A_negative_hill_coefficient_writes_calcium_dependent_inactivation()
    {
        // K/(K + ca) (common practice: one-site calcium inhibition): 1 at no calcium, 1/2 at K, 1/(1 + 10) at 10 K.
        var f = new GateSpec { Name = "f", Kind = GateKind.Calcium, Instantaneous = true, Calcium = new CalciumSensitivity(0.001, -1, 0) };
        Assert.Null(f.Problem());
        Assert.Equal(1, f.SteadyStateAt(0, 0), 15);
        Assert.Equal(0.5, f.SteadyStateAt(0, 0.001), 15);
        Assert.Equal(1 / 11.0, f.SteadyStateAt(30, 0.01), 15);
        // A rising gate of the same K and |n| is its complement.
        var q = new GateSpec { Name = "q", Kind = GateKind.Calcium, Calcium = new CalciumSensitivity(0.001, 1, 5) };
        foreach (var ca in new[] { 1e-5, 3e-4, 2e-3 }) Assert.Equal(1, f.SteadyStateAt(0, ca) + q.SteadyStateAt(0, ca), 14);
    }

    [Theory]
    [InlineData(0.001, 0.0, 5.0, false, "hill")]
    [InlineData(0.001, 9.0, 5.0, false, "hill")]
    [InlineData(0.0, 1.0, 5.0, false, "halfActivationMm")]
    [InlineData(0.001, 1.0, 0.0, false, "tauMs")]
    [InlineData(0.001, -1.0, 5.0, true, "tauMs")]
    public void Calcium_gate_parameters_out_of_range_are_named(double half, double hill, double tau, bool instantaneous, string named)
    {
        var g = new GateSpec { Name = "x", Kind = GateKind.Calcium, Instantaneous = instantaneous, Calcium = new CalciumSensitivity(half, hill, tau) };
        Assert.Contains(named, g.Problem());
    }
}
