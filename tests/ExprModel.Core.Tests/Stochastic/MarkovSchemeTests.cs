using ExprModel.Core.Stochastic;
using MathNet.Numerics.LinearAlgebra;

namespace ExprModel.Core.Tests.Stochastic;

public class MarkovSchemeTests
{
    [Fact]
    public void States_come_from_the_gate_powers()
    {
        // DOMAIN.md "Stochastic channels": n^4 gives five states, m^3 h eight.
        Assert.Equal(5, MarkovScheme.For(TestCatalog.Catalog.Resolve("squid-k-hh1952", null)).StateCount);
        var na = MarkovScheme.For(TestCatalog.Catalog.Resolve("squid-na-hh1952", null));
        Assert.Equal(8, na.StateCount);
        Assert.Equal("m3 h1", na.StateLabel(na.OpenState, ["m", "h"]));
    }

    [Theory]
    [InlineData(-80)]
    [InlineData(-40)]
    [InlineData(0)]
    [InlineData(30)]
    public void Stationary_open_probability_is_the_product_of_steady_state_gates_to_their_powers(double vMv)
    {
        // Stationary occupancy of independent gates is binomial in each gate (DOMAIN.md); its open state must equal
        // prod x_inf^p (ChannelEntry.SteadyStateOpenFraction), and the occupancy must be a null vector of the generated
        // generator (pi Q = 0), which checks the generated transitions, for every entry with kinetic gates.
        foreach (var entry in TestCatalog.Catalog.Latest.Where(e => e.Gates.Count > 0 && e.Gates.Any(g => !g.Instantaneous)))
        {
            var scheme = MarkovScheme.For(entry);
            var rates = new GateRates(entry, scheme, entry.ReferenceTemperatureC);
            int n = scheme.KineticGates.Count;
            var (alpha, beta, steady) = (new double[n], new double[n], new double[n]);
            const double ca = 2e-4;
            rates.At(vMv, ca, alpha, beta);
            rates.SteadyAt(vMv, ca, steady);
            var pi = scheme.StationaryOccupancy(steady);
            Assert.Equal(1, pi.Sum(), 12);
            double expected = entry.SteadyStateOpenFraction(vMv, ca) / rates.InstantaneousFactor(vMv, ca);
            Assert.Equal(expected, pi[scheme.OpenState], 12);

            var q = Generator(scheme, alpha, beta);
            var flow = Vector<double>.Build.DenseOfArray(pi) * q;
            double scale = Enumerable.Range(0, scheme.StateCount).Max(s => -q[s, s] * pi[s]) + 1e-300;
            Assert.True(flow.AbsoluteMaximum() <= 1e-10 * scale, $"{entry.Key} at {vMv} mV: pi Q = {flow.AbsoluteMaximum():G3}");
        }
    }

    internal static Matrix<double> Generator(MarkovScheme scheme, double[] alpha, double[] beta)
    {
        var (targets, rates) = scheme.NewTransitionTables();
        scheme.Transitions(alpha, beta, targets, rates);
        var q = Matrix<double>.Build.Dense(scheme.StateCount, scheme.StateCount);
        for (int s = 0; s < scheme.StateCount; s++)
            for (int t = 0; t < rates[s].Length; t++)
            {
                if (rates[s][t] == 0) continue;
                q[s, targets[s][t]] += rates[s][t];
                q[s, s] -= rates[s][t];
            }
        return q;
    }
}
