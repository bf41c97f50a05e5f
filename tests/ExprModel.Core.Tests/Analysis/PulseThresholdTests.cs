using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

public class PulseThresholdTests
{
    /// <summary>
    /// The search (four SIMD lanes per round, spike-only runs ending at the first spike) against a plain bisection on
    /// whole recorded scalar runs of the same pulse from the same settled rest; both ends must agree within the
    /// search's tolerance (0.5 %) plus the bisection's own (0.05 %).
    /// </summary>
    [Theory]
    [InlineData("hh1952", 1.0)]
    [InlineData("hh1952", 0.2)]
    [InlineData("wb1996", 0.5)]
    public void Threshold_matches_a_bisection_by_plain_simulation(string preset, double widthMs)
    {
        var cell = TestCatalog.Preset(preset);
        var (rest, firesAtRest) = PulseThreshold.SettledRest(cell);
        Assert.False(firesAtRest);
        var found = PulseThreshold.Find(cell, rest, widthMs);
        Assert.NotNull(found);

        bool Spikes(double amplitude) =>
            Simulator.Run(cell, PulseThreshold.Pulse(amplitude, widthMs), PulseThreshold.RunMs(widthMs), SimulationSettings.Default, rest)
                .SpikeTimesMs.Any(t => t >= PulseThreshold.DelayMs);
        double lo = 0, hi = 1;
        while (!Spikes(hi)) { lo = hi; hi *= 2; Assert.True(hi < 1e4, "no spike below 10000 uA/cm2"); }
        while (hi - lo > 5e-4 * hi)
        {
            double mid = (lo + hi) / 2;
            if (Spikes(mid)) hi = mid; else lo = mid;
        }
        Assert.InRange(found!.ThresholdUaPerCm2, hi * (1 - 5.5e-3), hi * (1 + 5.5e-3));
        Assert.True(found.BelowUaPerCm2 < found.ThresholdUaPerCm2);
        Assert.True(found.ThresholdUaPerCm2 - found.BelowUaPerCm2 <= 0.005 * found.ThresholdUaPerCm2 + 1e-12);
        Assert.True(Spikes(found.ThresholdUaPerCm2));
        Assert.False(Spikes(found.BelowUaPerCm2));
    }

    [Fact]
    public void Briefer_pulses_need_more_current_but_less_charge()
    {
        // Strength-duration relation (Lapicque 1907; common practice): threshold current falls with width, charge rises.
        var cell = TestCatalog.Preset("hh1952");
        var (rest, _) = PulseThreshold.SettledRest(cell);
        var brief = PulseThreshold.Find(cell, rest, 0.1)!;
        var longer = PulseThreshold.Find(cell, rest, 2)!;
        Assert.True(brief.ThresholdUaPerCm2 > longer.ThresholdUaPerCm2);
        Assert.True(brief.ChargeNcPerCm2 < longer.ChargeNcPerCm2);
    }

    [Fact]
    public void A_width_that_is_not_positive_is_refused()
    {
        var cell = TestCatalog.Preset("hh1952");
        var (rest, _) = PulseThreshold.SettledRest(cell);
        Assert.Throws<ArgumentOutOfRangeException>(() => PulseThreshold.Find(cell, rest, 0));
    }
}
