namespace ExprModel.Core.Simulation;

/// <summary>
/// The hot loop for one stimulus, one lane: the staggered scheme of <see cref="Simulator"/> on the cell's
/// <see cref="StepPlan"/>, recording what the settings ask for. Flat arrays, no allocation per step. The scalar
/// counterpart of <see cref="SweepKernel"/>: same order of operations, so the two agree to rounding.
/// </summary>
internal static class ScalarLoop
{
    /// <param name="firstStep">Step to start at (a resume point's; 0 from the beginning). Times and the stimulus stay those of the whole run.</param>
    /// <param name="previousVoltageMv">V one step before <paramref name="firstStep"/> (defaults to the initial V).</param>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static Trace Run(CompiledCell cell, RateTable table, Stimulus stimulus, int steps, SimulationSettings settings, CellState init,
        CancellationToken cancel,
        int firstStep = 0, double? previousVoltageMv = null)
    {
        // A step (or no current) is computed from its on-range; other stimuli are sampled once per step.
        double[]? stim = null;
        int onFirst = 0, onEnd = 0;
        double onValue = 0, offValue = 0;
        if (stimulus is StepCurrent sc)
        {
            (onFirst, onEnd) = sc.OnRange(settings.DtMs, steps);
            (onValue, offValue) = (sc.HoldingUaPerCm2 + sc.AmplitudeUaPerCm2, sc.HoldingUaPerCm2);
        }
        else if (stimulus is not NoCurrent)
        {
            stim = stimulus.Sample(settings.DtMs, steps);
        }
        int gateCount = cell.GateCount, channelCount = cell.ChannelCount;
        double dt = settings.DtMs;
        var x = (double[])init.Gates.Clone();
        double v = init.VoltageMv, ca = init.CalciumMm;
        double na = double.IsNaN(init.SodiumMm) ? cell.SodiumShellRestMm : init.SodiumMm;
        var data = table.Data;
        var caDecay = table.CalciumDecay;
        var plan = cell.Plan;
        var gbar = cell.Gbar;
        var erev = plan.ErevMv;
        var mode = plan.Mode;
        var update = plan.Update;
        var gateStart = plan.GateStart;
        var gateEnd = plan.GateEnd;
        var power = plan.GatePower;
        var carriesCalcium = plan.CarriesCalcium;
        var calciumRateExponent = Enumerable.Range(0, gateCount).Select(k => plan.CalciumRateExponent(k, dt)).ToArray();
        bool anyNernstCalcium = plan.AnyNernstCalcium, anyGhkCalcium = plan.AnyGhkCalcium, anySpecial = plan.AnyNonOhmic;
        double caThermalMv = Kinetics.Nernst.ThermalVoltageMv(cell.TemperatureC, 2), caOutsideMm = cell.CalciumOutsideMm;
        double vPrevious = previousVoltageMv ?? v;
        double cm = cell.CapacitanceUfPerCm2;
        double invRes = 1.0 / RateTable.ResolutionMv;
        int maxIndex = table.Points - 2;
        bool hasShell = cell.HasShell;
        double shellDecay = hasShell ? Math.Exp(-dt / cell.ShellDecayMs) : 0;
        double shellGain = hasShell ? cell.ShellInflowPerCurrent * cell.ShellDecayMs : 0;
        double shellRest = cell.ShellRestMm;
        // The sodium shell (KNa): the calcium shell's exact relaxation, filled by the sodium channels' current.
        bool hasSodiumShell = cell.HasSodiumShell;
        var carriesSodium = plan.CarriesSodium;
        double sodiumDecay = hasSodiumShell ? Math.Exp(-dt / cell.SodiumShellDecayMs) : 0;
        double sodiumGain = hasSodiumShell ? cell.SodiumInflowPerCurrent * cell.SodiumShellDecayMs : 0;
        double sodiumRest = cell.SodiumShellRestMm;

        int every = settings.RecordEvery;
        int samples = every > 0 ? (steps - firstStep) / every + 1 : 0;
        var tRec = new double[samples];
        var vRec = new double[samples];
        var iRec = new double[samples];
        double[][]? currents = every > 0 && settings.RecordCurrents ? Enumerable.Range(0, channelCount).Select(_ => new double[samples]).ToArray() : null;
        double[]? caRec = every > 0 && hasShell ? new double[samples] : null;
        double[]? naRec = every > 0 && hasSodiumShell ? new double[samples] : null;
        double[]? gatesRec = every > 0 && settings.RecordGateStates ? new double[samples * gateCount] : null;
        var spikes = new List<double>();
        var resumePoints = new List<ResumePoint>();
        bool keepResume = settings.KeepResumePoints;
        var detector = new SpikeDetector(settings.Spikes);
        detector.Feed(firstStep * dt, v, dt);
        var g = new double[channelCount];
        if (every > 0)
        {
            tRec[0] = firstStep * dt;
            vRec[0] = v;
            if (caRec is not null) caRec[0] = ca;
            if (naRec is not null) naRec[0] = na;
            if (currents is not null) RecordCurrents(cell, currents, 0, v, x, ca);
            if (gatesRec is not null) Array.Copy(x, 0, gatesRec, 0, gateCount);
        }

        int stepsRun = steps - firstStep;
        for (int s = firstStep; s < steps; s++)
        {
            if ((s & 0xFFF) == 0 && cancel.IsCancellationRequested) cancel.ThrowIfCancellationRequested();
            if (keepResume && s % SimulationSettings.ResumePointEverySteps == 0)
                resumePoints.Add(new ResumePoint(s, s * dt, new CellState(v, (double[])x.Clone(), ca, na), vPrevious));
            double pos = (v - RateTable.MinMv) * invRes;
            if (pos < 0) pos = 0;
            else if (pos > maxIndex) pos = maxIndex;
            int i = (int)pos;
            double f = pos - i;
            int j = 2 * i;
            for (int k = 0; k < gateCount; k++)
            {
                switch (update[k])
                {
                    case GateUpdate.Table:
                        {
                            var t = data[k]!;
                            double a = t[j] + f * (t[j + 2] - t[j]);
                            double b = t[j + 1] + f * (t[j + 3] - t[j + 1]);
                            x[k] = a * x[k] + b;
                            break;
                        }
                    case GateUpdate.TableInstantaneous:
                        {
                            // An instantaneous gate must sit at the V of the coming half step, not of this instant:
                            // extrapolate V to t + dt/2 so the scheme stays second order.
                            var t = data[k]!;
                            double pm = (v + 0.5 * (v - vPrevious) - RateTable.MinMv) * invRes;
                            if (pm < 0) pm = 0;
                            else if (pm > maxIndex) pm = maxIndex;
                            int im = (int)pm;
                            x[k] = t[2 * im + 1] + (pm - im) * (t[2 * im + 3] - t[2 * im + 1]);
                            break;
                        }
                    case GateUpdate.CalciumHill:
                        {
                            double inf = plan.HillSteadyState<ScalarLanes, double>(k, ca);
                            x[k] = inf + (x[k] - inf) * caDecay[k];
                            break;
                        }
                    case GateUpdate.CalciumRates:
                        {
                            // BK-type: both rates once per step give the steady state and the exact decay for the step.
                            double inf = plan.CalciumRatesSteadyState(k, v, ca, out double rateSum);
                            x[k] = inf + (x[k] - inf) * Math.Exp(rateSum * calciumRateExponent[k]);
                            break;
                        }
                    case GateUpdate.SodiumHill:
                        {
                            double inf = plan.HillSteadyState<ScalarLanes, double>(k, na);
                            x[k] = inf + (x[k] - inf) * caDecay[k];
                            break;
                        }
                }
            }

            double gSum = 0, gE = 0, extra = 0;
            // One Nernst potential of shell calcium per step, shared by every calcium channel and the shell update.
            double eCa = anyNernstCalcium ? caThermalMv * Math.Log(caOutsideMm / Math.Max(ca, 1e-9)) : 0;
            // Likewise one GHK term per step: it depends on V and shell calcium only, not on the channel.
            double ghk = anyGhkCalcium ? cell.CalciumDrivingMv(DriveMode.GhkCalcium, v, ca, eCa) : 0;
            for (int c = 0; c < channelCount; c++)
            {
                double gc = StepPlan.Conductance<ScalarLanes, double>(gbar[c], x, gateStart[c], gateEnd[c], power);
                g[c] = gc;
                if (!anySpecial || mode[c] == DriveMode.Ohmic)
                {
                    gSum += gc;
                    gE += gc * erev[c];
                }
                else
                {
                    extra += gc * (mode[c] == DriveMode.GhkCalcium ? ghk : cell.CalciumDrivingMv(mode[c], v, ca, eCa));
                }
            }
            double iStim = stim is not null ? stim[s] : s >= onFirst && s < onEnd ? onValue : offValue;
            double vOld = v;
            vPrevious = v;
            if (gSum > 1e-12)
            {
                double vInf = (gE + iStim - extra) / gSum;
                v = vInf + (v - vInf) * Math.Exp(-dt * gSum / cm);
            }
            else
            {
                v += dt * (iStim - extra) / cm;
            }

            if (hasShell)
            {
                double vMid = 0.5 * (v + vOld), ica = 0;
                double ghkMid = anyGhkCalcium ? cell.CalciumDrivingMv(DriveMode.GhkCalcium, vMid, ca, eCa) : 0;
                for (int c = 0; c < channelCount; c++)
                    if (carriesCalcium[c])
                        ica += g[c] * mode[c] switch
                        {
                            DriveMode.Ohmic => vMid - erev[c],
                            DriveMode.GhkCalcium => ghkMid,
                            _ => cell.CalciumDrivingMv(mode[c], vMid, ca, eCa),
                        };
                double caInf = shellRest - shellGain * ica;
                ca = caInf + (ca - caInf) * shellDecay;
                if (ca < 0) ca = 0;
            }

            if (hasSodiumShell)
            {
                // Sodium channels are ohmic (fixed E_Na): current at the midpoint V with the step's midpoint conductances.
                double vMid = 0.5 * (v + vOld), ina = 0;
                for (int c = 0; c < channelCount; c++)
                    if (carriesSodium[c]) ina += g[c] * (vMid - erev[c]);
                double naInf = sodiumRest - sodiumGain * ina;
                na = naInf + (na - naInf) * sodiumDecay;
                if (na < 0) na = 0;
            }

            if (!(v > -1000 && v < 1000))
                throw Simulator.BlowUp(cell, (s + 1) * dt, vOld, x, ca, iStim);

            double time = (s + 1) * dt;
            double spike = detector.Feed(time, v, dt);
            if (!double.IsNaN(spike))
            {
                spikes.Add(spike);
                if (every == 0 && settings.StopAtFirstSpikeAfterMs is { } after && spike >= after)
                {
                    stepsRun = s + 1 - firstStep;
                    break;
                }
            }

            if (every > 0 && (s + 1 - firstStep) % every == 0)
            {
                int r = (s + 1 - firstStep) / every;
                tRec[r] = time;
                vRec[r] = v;
                iRec[r] = iStim;
                if (caRec is not null) caRec[r] = ca;
                if (naRec is not null) naRec[r] = na;
                if (currents is not null) RecordCurrents(cell, currents, r, v, x, ca);
                if (gatesRec is not null) Array.Copy(x, 0, gatesRec, r * gateCount, gateCount);
            }
        }
        StepCounters.AddScalar(stepsRun);
        var dict = new Dictionary<string, double[]>();
        if (currents is not null)
            for (int c = 0; c < channelCount; c++) dict[Simulator.UniqueLabel(cell, c, dict)] = currents[c];
        return new Trace
        {
            SampleIntervalMs = every > 0 ? every * dt : 0,
            TimeMs = tRec,
            VoltageMv = vRec,
            StimulusUaPerCm2 = iRec,
            ChannelCurrentsUaPerCm2 = dict,
            CalciumMm = caRec,
            SodiumMm = naRec,
            GateStates = gatesRec,
            SpikeTimesMs = spikes,
            ResumePoints = resumePoints,
            FinalState = new CellState(v, x, ca, na),
            DurationMs = steps * dt,
        };
    }

    private static void RecordCurrents(CompiledCell cell, double[][] currents, int r, double v, double[] x, double ca)
    {
        for (int c = 0; c < cell.ChannelCount; c++) currents[c][r] = cell.ChannelCurrent(c, v, x, ca);
    }
}
