using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

public class GateRateTests
{
    [Fact]
    public void LinearOverExponentialTakesItsLimitAtTheSingularity()
    {
        // A (V - V0) / (1 - exp(-(V - V0)/k)) -> A k at V = V0 (L'Hopital; DOMAIN.md).
        var r = GateRate.LinearOverExponential(0.1, -40, 10);
        Assert.Equal(1.0, r.Evaluate(-40), 12);
        Assert.Equal(r.Evaluate(-40 + 1e-4), r.Evaluate(-40), 4);
        Assert.Equal(r.Evaluate(-40 - 1e-4), r.Evaluate(-40), 4);
    }

    [Fact]
    public void AlphaBetaGateConvertsToSteadyStateAndTau()
    {
        var g = new GateSpec { Name = "n", Alpha = GateRate.LinearOverExponential(0.01, -55, 10), Beta = GateRate.Exponential(0.125, -65, -80) };
        double a = g.Alpha!.Evaluate(-30), b = g.Beta!.Evaluate(-30);
        Assert.Equal(a / (a + b), g.SteadyStateAt(-30), 12);
        Assert.Equal(1 / (a + b), g.TimeConstantAt(-30), 12);
    }

    [Fact]
    public void Q10ScalesRatesPerTenDegrees()
    {
        var e = new ChannelEntry
        {
            Id = "x",
            Version = 1,
            Name = "x",
            Family = "leak",
            Ion = Ion.Nonspecific,
            Reversal = ReversalRule.Fixed,
            ReversalMv = 0,
            Gates = [],
            ReferenceTemperatureC = 6.3,
            Q10 = 3,
            TypicalDensityMsPerCm2 = 1,
            MinDensityMsPerCm2 = 0,
            MaxDensityMsPerCm2 = 2,
            Source = new Citation { Authors = "a", Year = 2000, Journal = "j" },
        };
        Assert.Equal(3.0, e.TemperatureFactor(16.3), 12);
        Assert.Equal(9.0, e.TemperatureFactor(26.3), 12);
        Assert.Equal(1.0, e.TemperatureFactor(6.3), 12);
    }
}
