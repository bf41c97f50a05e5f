using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

/// <summary>The two gate forms and their conversion, checked numerically against the other form on every catalog gate.</summary>
public sealed class GateFormsTests
{
    private static readonly double[] Voltages = [-100, -65, -40, -10, 0, 25];

    [Fact]
    public void Each_catalog_gate_converts_to_the_other_form_and_back_at_several_voltages()
    {
        int checkedGates = 0;
        foreach (var e in TestCatalog.Catalog.AllVersions)
            foreach (var g in e.Gates.Where(g => g.Kind != GateKind.Calcium && !g.Instantaneous))
            {
                double t = e.ReferenceTemperatureC + 10;
                double q = e.TemperatureFactor(t);
                foreach (var p in GateForms.At(e, g, Voltages, t))
                {
                    // The entry's own functions, evaluated by GateSpec (its steady state and time constant, Q10-scaled here).
                    Assert.Equal(g.SteadyStateAt(p.VoltageMv), p.SteadyState, 1e-9);
                    Assert.Equal(g.TimeConstantAt(p.VoltageMv) / q, p.TimeConstantMs, Math.Max(1e-9, 1e-9 * p.TimeConstantMs));
                    // Converting either way and back returns the start.
                    var (x, tau) = GateForms.ToSteadyState(p.AlphaPerMs, p.BetaPerMs);
                    Assert.Equal(p.SteadyState, x, 1e-12);
                    Assert.Equal(p.TimeConstantMs, tau, Math.Max(1e-12, 1e-12 * tau));
                    var (a, b) = GateForms.ToRates(p.SteadyState, p.TimeConstantMs);
                    Assert.Equal(p.AlphaPerMs, a, Math.Max(1e-12, 1e-9 * a));
                    Assert.Equal(p.BetaPerMs, b, Math.Max(1e-12, 1e-9 * b));
                    if (g.Kind == GateKind.AlphaBeta)
                        Assert.Equal(g.Alpha!.Evaluate(p.VoltageMv) * q * g.RateFactor, p.AlphaPerMs, Math.Max(1e-12, 1e-12 * p.AlphaPerMs));
                }
                checkedGates++;
            }
        Assert.True(checkedGates > 30, $"{checkedGates} gates");
    }

    [Fact]
    public void Squid_potassium_gate_at_rest_gives_the_published_steady_state()
    {
        // Hodgkin & Huxley 1952 (J Physiol 117:500), modern convention, V = -65 mV: alpha_n = 0.0582, beta_n = 0.125 per ms,
        // n_inf = 0.3177 (from memory; tolerance 1e-3).
        var e = TestCatalog.Catalog.Resolve("squid-k-hh1952", null);
        var p = GateForms.At(e, e.Gates.Single(g => g.Name == "n"), [-65], e.ReferenceTemperatureC).Single();
        Assert.Equal(0.0582, p.AlphaPerMs, 1e-3);
        Assert.Equal(0.125, p.BetaPerMs, 1e-3);
        Assert.Equal(0.3177, p.SteadyState, 1e-3);
        Assert.Equal(1 / (p.AlphaPerMs + p.BetaPerMs), p.TimeConstantMs, 1e-12);
    }

    [Fact]
    public void Parameter_counts_follow_the_written_forms()
    {
        // Squid sodium: m and h each written as two three-parameter rates (Hodgkin & Huxley 1952 forms).
        var na = TestCatalog.Catalog.Resolve("squid-na-hh1952", null);
        Assert.All(na.Gates, g => Assert.Equal(6, GateForms.ParameterCount(g)));
        Assert.Equal(12, GateForms.ParameterCount(na));
        // kv7-m-golomb2006: a Boltzmann (half-activation, slope) and a constant time constant.
        Assert.Equal(3, GateForms.ParameterCount(TestCatalog.Catalog.Resolve("kv7-m-golomb2006", null)));
        var leak = TestCatalog.Catalog.Resolve("leak", null);
        Assert.Equal(0, GateForms.ParameterCount(leak));
    }
}
