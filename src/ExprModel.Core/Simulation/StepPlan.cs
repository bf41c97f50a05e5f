using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The per-step recipe of a cell's kinetics, built once from <see cref="CellKinetics"/> and read by every loop: the
/// scalar loop (<see cref="ScalarLoop"/>), the SIMD sweep (<see cref="SweepKernel"/>) and, through
/// <see cref="CompiledCell"/>, the ODE right-hand side and the voltage clamp. It says how each gate is advanced
/// (<see cref="GateUpdate"/>), holds the constants of calcium-gated subunits, and writes the two formulas every loop
/// shares (the conductance product and the Hill steady state) once for any lane type (<see cref="ILaneMath{T}"/>).
/// A new gate type gets a <see cref="GateUpdate"/> value, its constants here, and its case in each loop's gate switch.
/// Hot loops copy the arrays (or, in the SIMD kernel, broadcast the constants) into locals before the loop and call the
/// static forms of the formulas: with the plan itself live in the loop the JIT ran out of registers and spilled.
/// </summary>
internal sealed class StepPlan
{
    public readonly int GateCount;
    public readonly int ChannelCount;
    public readonly GateUpdate[] Update;
    /// <summary>Per channel, its gates are [GateStart, GateEnd), each raised to <see cref="GatePower"/>.</summary>
    public readonly int[] GateStart;
    public readonly int[] GateEnd;
    public readonly int[] GatePower;
    public readonly double[] GateShiftMv;
    public readonly DriveMode[] Mode;
    public readonly double[] ErevMv;
    public readonly bool[] CarriesCalcium;
    public readonly bool[] CarriesSodium;
    /// <summary>Hill gates (calcium or sodium): |n|, n when it is a whole number 1 to 8 (powered by multiplication, else 0), direction, K^|n|.</summary>
    public readonly double[] HillMagnitude;
    public readonly int[] HillWholePower;
    public readonly bool[] HillRises;
    public readonly double[] HillHalfPower;
    /// <summary>Calcium-rate gates: the opening and closing rates as GateRate defines them, and their per-step form when both are calcium-bound
    /// shapes.</summary>
    public readonly GateRate?[] Opening;
    public readonly GateRate?[] Closing;
    public readonly CalciumBoundRate[] BoundOpening;
    public readonly CalciumBoundRate[] BoundClosing;
    private readonly double[] _rateFactor;
    private readonly double[] _temperatureFactor;
    public readonly bool AnyInstantaneous;
    public readonly bool AnySodiumGate;
    public readonly bool AnyNonOhmic;
    public readonly bool AnyNernstCalcium;
    public readonly bool AnyGhkCalcium;
    /// <summary>True when every calcium-rate gate uses the calcium-bound shapes the SIMD kernel evaluates.</summary>
    public readonly bool CalciumRatesAreBound;

    public StepPlan(CellKinetics k)
    {
        GateCount = k.GateCount;
        ChannelCount = k.ChannelCount;
        GateStart = k.GateStart;
        GateEnd = k.GateEnd;
        GatePower = k.GatePower;
        GateShiftMv = k.GateShiftMv;
        Mode = k.Mode;
        ErevMv = k.Erev;
        CarriesCalcium = k.CarriesCalcium;
        CarriesSodium = k.CarriesSodium;
        var gates = k.Gates;
        Update = new GateUpdate[GateCount];
        HillMagnitude = new double[GateCount];
        HillWholePower = new int[GateCount];
        HillRises = new bool[GateCount];
        HillHalfPower = new double[GateCount];
        Opening = new GateRate?[GateCount];
        Closing = new GateRate?[GateCount];
        BoundOpening = new CalciumBoundRate[GateCount];
        BoundClosing = new CalciumBoundRate[GateCount];
        _rateFactor = gates.Select(g => g.RateFactor).ToArray();
        _temperatureFactor = k.GateTemperatureFactor;
        CalciumRatesAreBound = true;
        for (int g = 0; g < GateCount; g++)
        {
            var gate = gates[g];
            if (gate.Kind == GateKind.Sodium)
            {
                // Same Hill constants as a calcium Hill gate; the loops feed it shell sodium instead.
                var na = gate.Sodium!;
                Update[g] = GateUpdate.SodiumHill;
                SetHill(g, na.HillCoefficient, na.HalfActivationMm);
                continue;
            }
            if (gate.Kind != GateKind.Calcium)
            {
                Update[g] = gate.Instantaneous ? GateUpdate.TableInstantaneous : GateUpdate.Table;
                continue;
            }
            if (gate.Calcium is { } hill)
            {
                // x_inf = ca^m / (ca^m + K^m), or K^m / (K^m + ca^m) for a negative coefficient (see CalciumSensitivity).
                Update[g] = GateUpdate.CalciumHill;
                SetHill(g, hill.HillCoefficient, hill.HalfActivationMm);
                continue;
            }
            Update[g] = GateUpdate.CalciumRates;
            (Opening[g], Closing[g]) = (gate.Alpha!, gate.Beta!);
            if (CalciumBoundRate.From(gate.Alpha!) is { } open && CalciumBoundRate.From(gate.Beta!) is { } close)
                (BoundOpening[g], BoundClosing[g]) = (open, close);
            else
                CalciumRatesAreBound = false;
        }
        AnySodiumGate = Update.Contains(GateUpdate.SodiumHill);
        AnyInstantaneous = Update.Contains(GateUpdate.TableInstantaneous);
        AnyNonOhmic = Mode.Any(m => m != DriveMode.Ohmic);
        AnyNernstCalcium = Mode.Contains(DriveMode.NernstCalcium);
        AnyGhkCalcium = Mode.Contains(DriveMode.GhkCalcium);
    }

    private void SetHill(int g, double coefficient, double halfActivationMm)
    {
        double m = Math.Abs(coefficient);
        HillMagnitude[g] = m;
        HillWholePower[g] = m == Math.Floor(m) && m is >= 1 and <= 8 ? (int)m : 0;
        HillRises[g] = coefficient > 0;
        HillHalfPower[g] = Math.Pow(halfActivationMm, m);
    }

    /// <summary>Conductance (mS/cm2) of channel c: its density times each gate raised to its power (by multiplication).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public T Conductance<TMath, T>(int c, T densityMsPerCm2, ReadOnlySpan<T> gates) where TMath : ILaneMath<T> where T : struct =>
        Conductance<TMath, T>(densityMsPerCm2, gates, GateStart[c], GateEnd[c], GatePower);

    /// <summary>
    /// The conductance product over gates [first, end) with their powers, for hot loops that keep the plan's arrays in
    /// locals (an instance call would reload them per channel).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static T Conductance<TMath, T>(T densityMsPerCm2, ReadOnlySpan<T> gates, int first, int end, int[] power) where TMath : ILaneMath<T> where T : struct
    {
        var g = densityMsPerCm2;
        for (int k = first; k < end; k++)
        {
            var x = gates[k];
            var p = x;
            for (int q = 1; q < power[k]; q++) p = TMath.Multiply(p, x);
            g = TMath.Multiply(g, p);
        }
        return g;
    }

    /// <summary>Steady state of Hill gate g at its shell concentration (calcium or sodium, mM): whole coefficients by multiplication, else a power.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public T HillSteadyState<TMath, T>(int g, T concentrationMm) where TMath : ILaneMath<T> where T : struct =>
        HillSteadyState<TMath, T>(concentrationMm, HillWholePower[g], TMath.Broadcast(HillMagnitude[g]), TMath.Broadcast(HillHalfPower[g]), HillRises[g]);

    /// <summary>
    /// The Hill steady state from a gate's constants (<see cref="HillWholePower"/>, <see cref="HillMagnitude"/>,
    /// <see cref="HillHalfPower"/>, <see cref="HillRises"/>), for hot loops that keep them broadcast in locals.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static T HillSteadyState<TMath, T>(T concentrationMm, int wholePower, T magnitude, T halfPower, bool rises)
        where TMath : ILaneMath<T> where T : struct
    {
        var c0 = TMath.Max(concentrationMm, TMath.Broadcast(0));
        T cn;
        if (wholePower > 0)
        {
            cn = c0;
            for (int h = 1; h < wholePower; h++) cn = TMath.Multiply(cn, c0);
        }
        else cn = TMath.Power(c0, magnitude);
        return TMath.Divide(rises ? cn : halfPower, TMath.Add(cn, halfPower));
    }

    /// <summary>Multiplier of the rate sum in the exponent of a calcium-rate gate's decay over a step: -dt x rate factor x temperature factor.</summary>
    public double CalciumRateExponent(int g, double dtMs) => -dtMs * _rateFactor[g] * _temperatureFactor[g];

    /// <summary>
    /// Steady state of calcium-rate gate g at V (mV, before the channel's shift) and calcium, with the rate sum
    /// alpha + beta (1/ms, before the rate and temperature factors; see <see cref="CalciumRateExponent"/>), rates as GateRate defines them.
    /// </summary>
    public double CalciumRatesSteadyState(int g, double vMv, double calciumMm, out double rateSumPerMs)
    {
        double vs = vMv - GateShiftMv[g];
        double opening = Opening[g]!.Evaluate(vs, calciumMm);
        rateSumPerMs = opening + Closing[g]!.Evaluate(vs, calciumMm);
        return opening / rateSumPerMs;
    }
}
