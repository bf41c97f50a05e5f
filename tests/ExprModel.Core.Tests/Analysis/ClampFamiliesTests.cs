using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

public class ClampFamiliesTests
{
    // Hodgkin & Huxley 1952, J Physiol 117:500, eqs 20-23 (rate constants in 1/ms, u = depolarisation from rest in mV),
    // written here in the modern sign convention with rest at -65 mV; gNa = 120 mS/cm2, E_Na = rest + 115 mV = +50 mV.
    private static double AlphaM(double v) { double u = v + 65; return Math.Abs(25 - u) < 1e-9 ? 1.0 : 0.1 * (25 - u) / (Math.Exp((25 - u) / 10) - 1); }
    private static double BetaM(double v) => 4 * Math.Exp(-(v + 65) / 18);
    private static double AlphaH(double v) => 0.07 * Math.Exp(-(v + 65) / 20);
    private static double BetaH(double v) => 1 / (Math.Exp((30 - (v + 65)) / 10) + 1);

    /// <summary>Largest |gNa m^3 h| over a step to <paramref name="commandMv"/> from the steady state at <paramref name="fromMv"/>, from the
    /// closed-form solution of the gate equations at fixed V (HH 1952 eqs 7 and 15-16), sampled on the clamp's 25 us grid.</summary>
    private static (double Conductance, double Current) Peak(double fromMv, double commandMv, double stepMs)
    {
        double m0 = AlphaM(fromMv) / (AlphaM(fromMv) + BetaM(fromMv)), h0 = AlphaH(fromMv) / (AlphaH(fromMv) + BetaH(fromMv));
        double am = AlphaM(commandMv), bm = BetaM(commandMv), ah = AlphaH(commandMv), bh = BetaH(commandMv);
        double mInf = am / (am + bm), tauM = 1 / (am + bm), hInf = ah / (ah + bh), tauH = 1 / (ah + bh);
        double best = 0;
        for (int k = 1; k * 0.025 <= stepMs + 1e-9; k++)
        {
            double t = k * 0.025, m = mInf + (m0 - mInf) * Math.Exp(-t / tauM), h = hInf + (h0 - hInf) * Math.Exp(-t / tauH);
            best = Math.Max(best, 120 * m * m * m * h);
        }
        return (best, best * (commandMv - 50));
    }

    [Fact]
    public void Sodium_iv_activation_and_inactivation_of_hh1952_match_the_gate_formulas()
    {
        var cell = TestCatalog.Preset("hh1952");
        var protocol = new ClampProtocol { HoldingMv = -80, FromMv = -100, ToMv = 40, IncrementMv = 10, CommandMs = 20, ConditioningMs = 100, TestMv = 0 };
        var curves = ClampFamilies.Measure(cell, protocol);
        string na = curves.Channels[0]; // the model file's first channel, squid-na-hh1952
        Assert.Equal(15, curves.CommandsMv.Length);
        var expectedG = curves.CommandsMv.Select(v => Peak(-80, v, 20).Conductance).ToArray();
        double gMax = expectedG.Max();
        for (int i = 0; i < curves.CommandsMv.Length; i++)
        {
            double v = curves.CommandsMv[i];
            var (g, current) = Peak(-80, v, 20);
            // The clamp advances each gate by its exact exponential relaxation, so on the same grid only rounding differs.
            Assert.Equal(current, curves.PeakUaPerCm2[na][i], 1e-6 * Math.Abs(current) + 1e-9);
            Assert.Equal(g / gMax, curves.Activation[na][i]!.Value, 1e-6);
        }
        // Inactivation: test peak at 0 mV after 100 ms at each conditioning potential, normalised.
        var expectedInact = curves.CommandsMv.Select(v => Peak(v, 0, 20).Conductance).ToArray();
        double inactMax = expectedInact.Max();
        // The formula starts from the steady state at the conditioning potential; 100 ms is over ten times tau_h (at most about
        // 9 ms at 6.3 C), so the holding state's trace left in h is below exp(-10), 5e-5.
        for (int i = 0; i < curves.CommandsMv.Length; i++)
            Assert.Equal(expectedInact[i] / inactMax, curves.Inactivation![na][i]!.Value, 1e-4);
        // Shape checks a physiologist would make: inward below E_Na, outward above; inactivation falls with depolarisation.
        Assert.True(curves.PeakUaPerCm2[na][Array.IndexOf(curves.CommandsMv, -20.0)] < 0);
        Assert.True(curves.PeakUaPerCm2[na][Array.IndexOf(curves.CommandsMv, 40.0)] < 0); // +40 is still below +50
        Assert.True(curves.Inactivation![na][0] > 0.99 && curves.Inactivation[na][^1] < 0.01);
    }

    [Fact]
    public void A_protocol_with_a_bad_setting_is_refused_naming_it()
    {
        var cell = TestCatalog.Preset("hh1952");
        var e = Assert.Throws<ArgumentException>(() => ClampFamilies.Measure(cell, new ClampProtocol { IncrementMv = 0 }));
        Assert.Contains("increment", e.Message);
        Assert.Contains("at most", new ClampProtocol { FromMv = -300, ToMv = 300, IncrementMv = 0.5 }.Problem());
    }
}
