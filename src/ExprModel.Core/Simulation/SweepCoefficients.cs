using System.Runtime.Intrinsics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// What the SIMD sweep (<see cref="SweepKernel"/>) needs from a cell's <see cref="StepPlan"/> and rate tables, made once
/// per sweep: the plan's constants broadcast to four lanes, the gates listed by how they are advanced, and the channels
/// that feed the calcium and sodium shells. The kernel copies the fields it uses every step into locals.
/// </summary>
internal sealed class SweepCoefficients
{
    public readonly int Gates, Channels;
    /// <summary>Gates by kind (<see cref="GateUpdate"/>), each list in gate order.</summary>
    public readonly int[] TableGates, InstantaneousGates, HillGates, CalciumRateGates;
    public readonly Vector256<double>[] Gbar, ErevMv;
    public readonly int[] GateStart, GateEnd, GatePower;
    public readonly DriveMode[] Mode;
    public readonly bool AnyNonOhmic, AnyNernst, AnyGhk;
    /// <summary>Channels whose current fills the calcium shell (in channel order), and those that fill the sodium shell.</summary>
    public readonly int[] CalciumCarriers, SodiumCarriers;

    // Hill gates (calcium or sodium): whole power, |n|, K^|n|, direction, and which shell they read.
    public readonly int[] HillWhole;
    public readonly Vector256<double>[] HillMagnitude, HillHalfPower;
    public readonly bool[] HillRises, ReadsSodium;
    /// <summary>Per-step decay e^(-dt/tau) of Hill gates (their tau does not depend on V).</summary>
    public readonly Vector256<double>[] ConcentrationDecay;

    // Calcium-bound (BK-type) rate gates: opening and closing rates (the flags pick CalciumBoundRate's opening formula), the
    // channel's shift, and -dt x rate and temperature factors.
    public readonly bool[] OpenShape, CloseShape;
    public readonly Vector256<double>[] OpenA, OpenC1, OpenK, CloseA, CloseC1, CloseK, ShiftMv, RateExponent;

    public SweepCoefficients(CompiledCell cell, RateTable table, double dtMs)
    {
        var plan = cell.Plan;
        Gates = cell.GateCount;
        Channels = cell.ChannelCount;
        var gates = Enumerable.Range(0, Gates).ToArray();
        TableGates = gates.Where(g => plan.Update[g] == GateUpdate.Table).ToArray();
        InstantaneousGates = gates.Where(g => plan.Update[g] == GateUpdate.TableInstantaneous).ToArray();
        HillGates = gates.Where(g => plan.Update[g] is GateUpdate.CalciumHill or GateUpdate.SodiumHill).ToArray();
        CalciumRateGates = gates.Where(g => plan.Update[g] == GateUpdate.CalciumRates).ToArray();
        Gbar = cell.Gbar.Select(Vector256.Create).ToArray();
        ErevMv = plan.ErevMv.Select(Vector256.Create).ToArray();
        (GateStart, GateEnd, GatePower, Mode) = (plan.GateStart, plan.GateEnd, plan.GatePower, plan.Mode);
        (AnyNonOhmic, AnyNernst, AnyGhk) = (plan.AnyNonOhmic, plan.AnyNernstCalcium, plan.AnyGhkCalcium);
        var channels = Enumerable.Range(0, Channels).ToArray();
        CalciumCarriers = channels.Where(c => plan.CarriesCalcium[c]).ToArray();
        SodiumCarriers = channels.Where(c => plan.CarriesSodium[c]).ToArray();

        HillWhole = plan.HillWholePower;
        HillMagnitude = plan.HillMagnitude.Select(Vector256.Create).ToArray();
        HillHalfPower = plan.HillHalfPower.Select(Vector256.Create).ToArray();
        HillRises = plan.HillRises;
        ReadsSodium = plan.Update.Select(u => u == GateUpdate.SodiumHill).ToArray();
        ConcentrationDecay = table.CalciumDecay.Select(Vector256.Create).ToArray();

        OpenShape = plan.BoundOpening.Select(r => r.Opens).ToArray();
        OpenA = plan.BoundOpening.Select(r => Vector256.Create(r.MaxRatePerMs)).ToArray();
        OpenC1 = plan.BoundOpening.Select(r => Vector256.Create(r.DissociationAtZeroMm)).ToArray();
        OpenK = plan.BoundOpening.Select(r => Vector256.Create(r.MinusInverseKPerMv)).ToArray();
        CloseShape = plan.BoundClosing.Select(r => r.Opens).ToArray();
        CloseA = plan.BoundClosing.Select(r => Vector256.Create(r.MaxRatePerMs)).ToArray();
        CloseC1 = plan.BoundClosing.Select(r => Vector256.Create(r.DissociationAtZeroMm)).ToArray();
        CloseK = plan.BoundClosing.Select(r => Vector256.Create(r.MinusInverseKPerMv)).ToArray();
        ShiftMv = plan.GateShiftMv.Select(Vector256.Create).ToArray();
        // exp(-dt * (alpha + beta) * rateFactor * temperature factor): the same tau the scalar loop takes.
        RateExponent = gates.Select(g => Vector256.Create(plan.CalciumRateExponent(g, dtMs))).ToArray();
    }
}
