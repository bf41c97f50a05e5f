namespace ExprModel.Core.Kinetics;

/// <summary>
/// One parametric function of membrane potential (mV). Catalog entries store the shape and its
/// parameters, never code, so a reviewer can compare them with the paper's table.
/// </summary>
public sealed record GateRate
{
    public required RateShape Shape { get; init; }
    public double A { get; init; } = 1;
    public double V0 { get; init; }
    public double K { get; init; } = 1;
    public double Exponent { get; init; } = 1;
    public double Floor { get; init; }
    public double Base { get; init; }
    public double V1 { get; init; }
    public double K1 { get; init; } = 1;
    public double C1 { get; init; } = 1;
    public double C2 { get; init; } = 1;

    public static GateRate Exponential(double a, double v0, double k) => new() { Shape = RateShape.Exponential, A = a, V0 = v0, K = k };
    public static GateRate Sigmoid(double a, double v0, double k) => new() { Shape = RateShape.Sigmoid, A = a, V0 = v0, K = k };
    public static GateRate LinearOverExponential(double a, double v0, double k) => new() { Shape = RateShape.LinearOverExponential, A = a, V0 = v0, K = k };
    public static GateRate Boltzmann(double vHalf, double slope, double exponent = 1, double floor = 0) =>
        new() { Shape = RateShape.Boltzmann, V0 = vHalf, K = slope, Exponent = exponent, Floor = floor };
    public static GateRate Constant(double value) => new() { Shape = RateShape.Constant, A = value };
    public static GateRate Bell(double baseMs, double amplitude, double vRise, double kRise, double vFall, double kFall, double c1 = 1, double c2 = 1) =>
        new() { Shape = RateShape.Bell, Base = baseMs, A = amplitude, V0 = vRise, K = kRise, V1 = vFall, K1 = kFall, C1 = c1, C2 = c2 };
    public static GateRate Gaussian(double baseMs, double amplitude, double vPeak, double width) =>
        new() { Shape = RateShape.Gaussian, Base = baseMs, A = amplitude, V0 = vPeak, K = width };
    public static GateRate OffsetSigmoid(double baseMs, double amplitude, double v0, double k) =>
        new() { Shape = RateShape.OffsetSigmoid, Base = baseMs, A = amplitude, V0 = v0, K = k };
    public static GateRate InverseRateSum(double a, double v0, double k, double c1, double v1, double k1) =>
        new() { Shape = RateShape.InverseRateSum, A = a, V0 = v0, K = k, C1 = c1, V1 = v1, K1 = k1 };
    public static GateRate CalciumBoundOpening(double maxRatePerMs, double dissociationAtZeroMm, double kMv) =>
        new() { Shape = RateShape.CalciumBoundOpening, A = maxRatePerMs, C1 = dissociationAtZeroMm, K = kMv };
    public static GateRate CalciumBoundClosing(double maxRatePerMs, double dissociationAtZeroMm, double kMv) =>
        new() { Shape = RateShape.CalciumBoundClosing, A = maxRatePerMs, C1 = dissociationAtZeroMm, K = kMv };

    /// <summary>Intracellular calcium (mM) assumed when a calcium-dependent rate is evaluated without one (50 nM, as in
    /// <see cref="GateSpec.SteadyStateAt"/>).</summary>
    public const double RestingCalciumMm = 5e-5;

    /// <summary>True for the shapes whose value depends on intracellular calcium as well as voltage.</summary>
    public bool DependsOnCalcium => Shape is RateShape.CalciumBoundOpening or RateShape.CalciumBoundClosing;

    /// <summary>Value at <paramref name="vMv"/> (mV) and intracellular calcium <paramref name="calciumMm"/> (mM); voltage-only shapes ignore calcium.</summary>
    public double Evaluate(double vMv, double calciumMm)
    {
        switch (Shape)
        {
            case RateShape.CalciumBoundOpening:
                {
                    double ca = Math.Max(calciumMm, 1e-12);
                    return A / (1 + C1 * Math.Exp(-vMv / K) / ca);
                }
            case RateShape.CalciumBoundClosing:
                {
                    double ca = Math.Max(calciumMm, 0);
                    return A / (1 + ca / (C1 * Math.Exp(-vMv / K)));
                }
            default:
                return Evaluate(vMv);
        }
    }

    /// <summary>Value at membrane potential <paramref name="vMv"/> (mV).</summary>
    public double Evaluate(double vMv)
    {
        switch (Shape)
        {
            case RateShape.Exponential:
                return A * Math.Exp((vMv - V0) / K);
            case RateShape.Sigmoid:
                return A / (1 + Math.Exp((vMv - V0) / K));
            case RateShape.LinearOverExponential:
                {
                    // Removable singularity at V = V0: x / (1 - exp(-x/k)) -> k (1 + x/(2k)) for small x.
                    double x = vMv - V0;
                    double u = x / K;
                    if (Math.Abs(u) < 1e-6)
                        return A * K * (1 + u / 2);
                    return A * x / (1 - Math.Exp(-u));
                }
            case RateShape.Boltzmann:
                {
                    double b = 1 / (1 + Math.Exp((V0 - vMv) / K));
                    if (Exponent != 1) b = Math.Pow(b, Exponent);
                    return Floor + (1 - Floor) * b;
                }
            case RateShape.Constant:
                return A;
            case RateShape.Bell:
                return Base + A / (C1 * Math.Exp((vMv - V0) / K) + C2 * Math.Exp(-(vMv - V1) / K1));
            case RateShape.Gaussian:
                {
                    double z = (vMv - V0) / K;
                    return Base + A * Math.Exp(-z * z);
                }
            case RateShape.OffsetSigmoid:
                return Base + A / (1 + Math.Exp((vMv - V0) / K));
            case RateShape.InverseRateSum:
                return 1 / (LinearOverExponential(A, V0, K).Evaluate(vMv) + LinearOverExponential(C1, V1, K1).Evaluate(vMv));
            case RateShape.CalciumBoundOpening or RateShape.CalciumBoundClosing:
                return Evaluate(vMv, RestingCalciumMm);
            default:
                throw new InvalidOperationException($"Unknown rate shape {Shape}.");
        }
    }

    /// <summary>Checks the parameters for values that make the form undefined; returns the offending parameter or null.</summary>
    public string? Problem()
    {
        static bool Bad(double x) => double.IsNaN(x) || double.IsInfinity(x);
        if (Bad(A) || Bad(V0) || Bad(K) || Bad(Exponent) || Bad(Floor) || Bad(Base) || Bad(V1) || Bad(K1) || Bad(C1) || Bad(C2))
            return "a parameter is not a finite number";
        return Shape switch
        {
            RateShape.Exponential or RateShape.Sigmoid or RateShape.LinearOverExponential or RateShape.Boltzmann or RateShape.Gaussian when K == 0 =>
                "k must not be zero",
            RateShape.Bell or RateShape.InverseRateSum when K == 0 || K1 == 0 => "k and k1 must not be zero",
            RateShape.OffsetSigmoid when K == 0 => "k must not be zero",
            RateShape.CalciumBoundOpening or RateShape.CalciumBoundClosing when K == 0 => "k must not be zero",
            RateShape.CalciumBoundOpening or RateShape.CalciumBoundClosing when !(C1 > 0) => "c1 (dissociation constant at 0 mV, mM) must be positive",
            RateShape.Boltzmann when Floor < 0 || Floor >= 1 => "floor must lie in [0, 1)",
            RateShape.Boltzmann when Exponent <= 0 => "exponent must be positive",
            _ => null,
        };
    }
}
