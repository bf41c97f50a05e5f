namespace ExprModel.Core.Stochastic;

/// <summary>How one channel type of a whole cell is simulated with channel noise.</summary>
public enum ChannelNoiseMethod
{
    /// <summary>No kinetic gates (a leak, or only instantaneous gates): the mean conductance, no noise.</summary>
    Deterministic,
    /// <summary>Channel-number tracking with binomial updates: an exact sample of the Markov chain per step (small counts).</summary>
    BinomialTracking,
    /// <summary>Diffusion approximation: mean gates plus one Ornstein-Uhlenbeck process per eigenmode (Linaro et al. 2011; large counts).</summary>
    Diffusion,
}
