namespace ExprModel.Core.Stochastic;

/// <summary>A scheme's transitions at one clamp voltage: per state its exit rate, targets and their rates.</summary>
internal sealed class SegmentTable
{
    public required double[] Exit { get; init; }
    public required int[][] Targets { get; init; }
    public required double[][] Rates { get; init; }

    public static SegmentTable For(MarkovScheme scheme, GateRates rates, double vMv, double calciumMm, int gates)
    {
        var alpha = new double[gates];
        var beta = new double[gates];
        rates.At(vMv, calciumMm, alpha, beta);
        var (targets, r) = scheme.NewTransitionTables();
        scheme.Transitions(alpha, beta, targets, r);
        var exit = new double[scheme.StateCount];
        for (int s = 0; s < exit.Length; s++) exit[s] = r[s].Sum();
        return new SegmentTable { Exit = exit, Targets = targets, Rates = r };
    }
}
