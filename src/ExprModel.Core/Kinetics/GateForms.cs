namespace ExprModel.Core.Kinetics;

/// <summary>
/// The two standard forms of a voltage-dependent gate and the conversion between them (Hodgkin &amp; Huxley 1952; DOMAIN.md):
/// from rates, x_inf = alpha/(alpha + beta) and tau = 1/(alpha + beta); back, alpha = x_inf/tau and beta = (1 - x_inf)/tau. Rates
/// include the gate's rate factor and the entry's Q10 factor at the temperature; calcium gates and instantaneous gates have no
/// voltage-only pair of rates and give none. Also counts the parameters a gate's functions are written with.
/// </summary>
public static class GateForms
{
    /// <summary>True when the gate is written as alpha and beta (the steady state and time constant are then converted).</summary>
    public static bool WrittenAsRates(GateSpec g) => g.Kind == GateKind.AlphaBeta;

    /// <summary>Both forms at each voltage; empty for calcium and instantaneous gates.</summary>
    public static IReadOnlyList<GateFormPoint> At(ChannelEntry entry, GateSpec g, IEnumerable<double> voltagesMv, double temperatureC)
    {
        if (g.Kind == GateKind.Calcium || g.Instantaneous) return [];
        double q = entry.TemperatureFactor(temperatureC) * g.RateFactor;
        var points = new List<GateFormPoint>();
        foreach (var v in voltagesMv)
        {
            if (g.Kind == GateKind.AlphaBeta)
            {
                double a = g.Alpha!.Evaluate(v) * q, b = g.Beta!.Evaluate(v) * q;
                var (x, tau) = ToSteadyState(a, b);
                points.Add(new GateFormPoint(v, a, b, x, tau));
            }
            else
            {
                double x = g.SteadyState!.Evaluate(v), tau = g.TimeConstantMs!.Evaluate(v) / q;
                var (a, b) = ToRates(x, tau);
                points.Add(new GateFormPoint(v, a, b, x, tau));
            }
        }
        return points;
    }

    /// <summary>x_inf = alpha/(alpha + beta), tau = 1/(alpha + beta).</summary>
    public static (double SteadyState, double TimeConstantMs) ToSteadyState(double alphaPerMs, double betaPerMs) =>
        (alphaPerMs / (alphaPerMs + betaPerMs), 1 / (alphaPerMs + betaPerMs));

    /// <summary>alpha = x_inf/tau, beta = (1 - x_inf)/tau.</summary>
    public static (double AlphaPerMs, double BetaPerMs) ToRates(double steadyState, double timeConstantMs) =>
        (steadyState / timeConstantMs, (1 - steadyState) / timeConstantMs);

    /// <summary>
    /// Parameters of a gate's functions as written: each rate function's shape parameters (optional ones only when set: a
    /// Boltzmann's exponent and floor, a bell's base and weights), a calcium gate's half-activation, Hill coefficient and time
    /// constant, and the rate factor when it is not 1. The power is not counted (it is an integer of the model's form).
    /// </summary>
    public static int ParameterCount(GateSpec g)
    {
        int n = g.RateFactor != 1 ? 1 : 0;
        foreach (var r in new[] { g.Alpha, g.Beta, g.SteadyState, g.TimeConstantMs })
            if (r is not null) n += ParameterCount(r);
        if (g.Calcium is not null) n += g.Instantaneous ? 2 : 3;
        return n;
    }

    /// <summary>Every gate's parameters summed.</summary>
    public static int ParameterCount(ChannelEntry e) => e.Gates.Sum(ParameterCount);

    private static int ParameterCount(GateRate r) => r.Shape switch
    {
        RateShape.Exponential or RateShape.Sigmoid or RateShape.LinearOverExponential => 3,
        RateShape.Boltzmann => 2 + (r.Exponent != 1 ? 1 : 0) + (r.Floor != 0 ? 1 : 0),
        RateShape.Constant => 1,
        RateShape.Bell => 5 + (r.Base != 0 ? 1 : 0) + (r.C1 != 1 ? 1 : 0) + (r.C2 != 1 ? 1 : 0),
        RateShape.Gaussian or RateShape.OffsetSigmoid => 4,
        RateShape.InverseRateSum => 6,
        _ => 3,
    };
}
