using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

public class ChannelPopulationTests
{
    [Theory]
    [InlineData(3, 1, 3)]      // a few flipping channels: one categorical draw each
    [InlineData(3, 1, 400)]    // many: sequential binomials
    [InlineData(4, 2, 2000)]
    [InlineData(1, 0, 500)]
    public void One_gate_move_matches_the_subunit_by_subunit_outcome_distribution(int power, int openSubunits, int channels)
    {
        // Derivation in the test: each of the p subunits flips independently (an open one closes with probability c, a
        // closed one opens with probability o), so enumerating the 2^p flip patterns gives the probability T[k'] that a
        // channel with k open ends with k' open. After one move of N channels from state k, the count in k' is binomial
        // (N, T[k']): its mean over R seeded repetitions must lie within 4 standard errors, sqrt(N T (1 - T) / R).
        const double o = 0.2, c = 0.3;
        const int reps = 4000;
        var t = new double[power + 1];
        for (int pattern = 0; pattern < 1 << power; pattern++)
        {
            double prob = 1;
            int end = 0;
            for (int u = 0; u < power; u++)
            {
                bool isOpen = u < openSubunits, flips = (pattern >> u & 1) == 1;
                prob *= isOpen ? (flips ? c : 1 - c) : (flips ? o : 1 - o);
                if (isOpen != flips) end++;
            }
            t[end] += prob;
        }
        var scheme = new MarkovScheme([power], [false]);
        var rng = new StochasticRandom(21);
        var sum = new double[power + 1];
        for (int r = 0; r < reps; r++)
        {
            var start = new int[power + 1];
            start[openSubunits] = channels;
            var population = new ChannelPopulation(scheme, start);
            population.Move(0, o, c, rng, 25);
            Assert.Equal(channels, population.Counts.ToArray().Sum());
            for (int k = 0; k <= power; k++) sum[k] += population.Counts[k];
        }
        for (int k = 0; k <= power; k++)
        {
            double mean = sum[k] / reps, se = Math.Sqrt(channels * t[k] * (1 - t[k]) / reps);
            Assert.InRange(mean, channels * t[k] - 4 * se - 1e-9, channels * t[k] + 4 * se + 1e-9);
        }
    }
}
