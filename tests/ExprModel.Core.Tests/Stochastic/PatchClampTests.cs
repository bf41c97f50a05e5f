using ExprModel.Core.Kinetics;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

public class PatchClampTests
{
    private static ChannelEntry Entry(string id) => TestCatalog.Catalog.Resolve(id, null);

    [Theory]
    [InlineData("squid-na-hh1952", 0.0, 20, 50, 200)]
    [InlineData("squid-k-hh1952", 0.0, 1000, 10, 5)]
    public void Mean_open_dwell_time_is_the_inverse_of_the_rates_leaving_the_open_state(string id, double stepMv, double stepMs, int channels, int sweeps)
    {
        // Derivation: in the open state every subunit of every gate is open (k_g = p_g), so the only exits are closings
        // of one subunit, each at beta_g: the open state is left at R = sum_g p_g beta_g, and its dwell time is
        // exponential with mean 1/R (a Markov state's sojourn). Rates straight from the entry's alpha/beta shapes at
        // its reference temperature (Hodgkin & Huxley 1952 gates, temperature factor 1).
        var entry = Entry(id);
        double r = entry.Gates.Sum(g => g.Power * g.Beta!.Evaluate(stepMv) * g.RateFactor);
        var result = PatchClamp.Run(new PatchSettings
        {
            Entry = entry,
            UnitaryConductancePs = 10,
            ChannelCount = channels,
            HoldingMv = -70,
            StepMv = stepMv,
            StepMs = stepMs,
            Sweeps = sweeps,
            Seed = 11,
            SampleIntervalMs = 0.5,
        });
        var dwells = result.OpenDwellsMs;
        Assert.True(dwells.Count > 2000, $"only {dwells.Count} open dwells");
        // Dwells still open at the end of the step are left out, which biases the mean short by about mean^2 / step
        // (for exponential dwells): under 0.1 standard errors for sodium (mean open time well under 1 ms, 20 ms step),
        // about 0.3 for potassium (about 4.5 ms, 1000 ms step).
        double mean = dwells.Average(), se = (1 / r) / Math.Sqrt(dwells.Count);
        Assert.InRange(mean, 1 / r - 3 * se, 1 / r + 3 * se);
        Assert.Equal(1 / r, result.DwellTheory.MeanOpenMs, 9);
    }

    [Fact]
    public void Current_variance_at_steady_state_is_binomial()
    {
        // N i^2 p (1 - p) for N independent channels each open with probability p (binomial; common practice).
        // Held and stepped at -40 mV, so the channels stay in their stationary occupancy throughout.
        var s = PatchEnsembles.PotassiumAt(TestCatalog.Catalog, -40, channels: 20, sweeps: 2000) with
        {
            StepMs = 40,
            SampleIntervalMs = 0.5,
            Seed = 5,
            KeptSweeps = 0,
            DwellSweeps = 0,
        };
        var result = PatchClamp.Run(s);
        double p = s.Entry.SteadyStateOpenFraction(-40), i = result.UnitaryCurrentAtStepPa;
        double expected = s.ChannelCount * i * i * p * (1 - p);
        double measured = result.VarianceCurrentPa2.Average();
        // Each sample's variance has relative standard error about sqrt(2/(K-1)); 4 of those, without credit for
        // averaging over samples, is a conservative band.
        double band = 4 * Math.Sqrt(2.0 / (s.Sweeps - 1));
        Assert.InRange(measured / expected, 1 - band, 1 + band);
        Assert.InRange(result.MeasuredOpenProbability, p * 0.9, p * 1.1);
    }

    [Fact]
    public void Ensemble_mean_lies_within_three_standard_errors_of_the_deterministic_current_at_every_sample()
    {
        var s = PatchEnsembles.SodiumStep(TestCatalog.Catalog, channels: 20, sweeps: 1000) with
        {
            PreStepMs = 2,
            StepMs = 10,
            SampleIntervalMs = 0.2,
            Seed = 3,
            KeptSweeps = 2,
        };
        var r = PatchClamp.Run(s);
        for (int j = 0; j < r.TimesMs.Length; j++)
        {
            // Standard error of the mean of K sweeps from the binomial variance at the deterministic open fraction.
            double i = r.UnitaryCurrentAtStepPa * (r.CommandMv[j] - r.ReversalMv) / (s.StepMv - r.ReversalMv);
            double p = i == 0 ? 0 : r.DeterministicCurrentPa[j] / (s.ChannelCount * i);
            double se = Math.Sqrt(s.ChannelCount * i * i * p * (1 - p) / s.Sweeps);
            Assert.True(Math.Abs(r.MeanCurrentPa[j] - r.DeterministicCurrentPa[j]) <= 3 * se + 1e-12,
                $"t = {r.TimesMs[j]} ms: mean {r.MeanCurrentPa[j]:G4} pA, deterministic {r.DeterministicCurrentPa[j]:G4} pA, SE {se:G3}");
        }
        Assert.Equal(2, r.SweepCurrentsPa.Count);
        // The step opens sodium channels: a peak of at least a tenth of N i (inward).
        Assert.True(r.DeterministicCurrentPa.Min() < 0.1 * s.ChannelCount * r.UnitaryCurrentAtStepPa, "the step should open sodium channels");
    }

    [Fact]
    public void Variance_mean_parabola_recovers_the_unitary_current_and_channel_count()
    {
        var s = PatchEnsembles.SodiumStep(TestCatalog.Catalog, channels: 100, sweeps: 600, stepMv: -10) with
        {
            PreStepMs = 1,
            StepMs = 8,
            SampleIntervalMs = 0.05,
            Seed = 9,
            KeptSweeps = 0,
            DwellSweeps = 0,
        };
        var r = PatchClamp.Run(s);
        var fit = r.NoiseFit!;
        // Noise analysis (common practice): the fitted initial slope is i, the root N. Band: 15 % for 600 sweeps.
        Assert.InRange(fit.UnitaryCurrentPa / r.UnitaryCurrentAtStepPa, 0.85, 1.15);
        Assert.InRange(fit.ChannelCount / s.ChannelCount, 0.85, 1.15);
    }

    [Fact]
    public void Closed_dwell_times_of_a_stationary_patch_follow_the_theory()
    {
        var r = PatchClamp.Run(PatchEnsembles.PotassiumAt(TestCatalog.Catalog, -30, channels: 20, sweeps: 50) with
        {
            StepMs = 200,
            SampleIntervalMs = 1,
            Seed = 2,
            DwellSweeps = 50,
        });
        // The closed-time density integrates to 1 (trapezoid on a fine grid out to 40 mean closed times).
        double mean = r.DwellTheory.MeanClosedMs, dt = mean / 2000, area = 0;
        for (int k = 0; k < 80_000; k++) area += 0.5 * dt * (r.DwellTheory.ClosedDensity(k * dt) + r.DwellTheory.ClosedDensity((k + 1) * dt));
        Assert.Equal(1, area, 3);
        var closed = r.ClosedDwellsMs;
        double m = closed.Average(), sd = Math.Sqrt(closed.Sum(x => (x - m) * (x - m)) / (closed.Count - 1));
        // Dwells cut by the 200 ms window bias the sample slightly short; 4 standard errors.
        Assert.InRange(m, mean - 4 * sd / Math.Sqrt(closed.Count), mean + 4 * sd / Math.Sqrt(closed.Count));
    }

    [Fact]
    public void Same_seed_gives_the_same_result()
    {
        var s = PatchEnsembles.SodiumStep(TestCatalog.Catalog, channels: 30, sweeps: 20) with { StepMs = 5, Seed = 77 };
        var a = PatchClamp.Run(s);
        var b = PatchClamp.Run(s);
        Assert.Equal(a.MeanCurrentPa, b.MeanCurrentPa);
        Assert.Equal(a.OpenDwellsMs, b.OpenDwellsMs);
        Assert.NotEqual(a.MeanCurrentPa, PatchClamp.Run(s with { Seed = 78 }).MeanCurrentPa);
    }

    [Fact]
    public void Bad_settings_name_the_setting()
    {
        var e = Assert.Throws<ArgumentException>(() => PatchClamp.Run(new PatchSettings { Entry = Entry("leak"), UnitaryConductancePs = 10 }));
        Assert.Contains("no gates", e.Message);
        e = Assert.Throws<ArgumentException>(() =>
            PatchClamp.Run(new PatchSettings { Entry = Entry("squid-k-hh1952"), UnitaryConductancePs = 10, ChannelCount = 20_000 }));
        Assert.Contains("channels", e.Message);
    }
}
